// Glint: Nuxt 4 app with server routes on SQLite (see DEVELOPERS.md for the map of the code).
// GLINT_BUILD_TAG lets parallel builds (tests, benchmarks) use their own output folders.
const tag = process.env.GLINT_BUILD_TAG

export default defineNuxtConfig({
  modules: ['@nuxt/eslint', '@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Glint',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'description', content: 'Glint: recognition drill for lookouts and spotters.' },
        { name: 'theme-color', content: '#0f2a3d' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/glint-mark.svg' }],
    },
  },
  css: ['~/assets/css/main.css'],
  runtimeConfig: {
    databasePath: '.data/glint.sqlite',
    uploadsDir: 'uploads',
    mailUrl: '',
    mailFrom: 'Glint <no-reply@glint.local>',
    publicUrl: '',
    session: {
      // Sessions end after 12 hours (the module's default never expires).
      maxAge: 60 * 60 * 12,
      cookie: { sameSite: 'lax', httpOnly: true },
    },
  },
  buildDir: tag ? `.nuxt-${tag}` : '.nuxt',
  compatibilityDate: '2025-07-15',
  nitro: {
    output: tag ? { dir: `.output-${tag}` } : undefined,
    experimental: { tasks: true },
    externals: { external: ['better-sqlite3'] },
  },
  typescript: { strict: true },
  telemetry: false,
  eslint: { config: { stylistic: true } },
  tailwindcss: { cssPath: false, exposeConfig: false, viewer: false },
})
