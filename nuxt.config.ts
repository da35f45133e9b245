// Glint: Nuxt 4 app with server routes on SQLite (see DEVELOPERS.md for the map of the code).
// GLINT_BUILD_TAG lets parallel builds (tests, benchmarks) use their own output folders.
import { createRequire } from 'node:module'

const tag = process.env.GLINT_BUILD_TAG
// The optimizer's package as the fit's child process imports it (its ES module entry).
const fitBinding = createRequire(import.meta.url).resolve('@open-spaced-repetition/binding').replace(/index\.cjs$/, 'index.mjs')

export default defineNuxtConfig({
  modules: ['@nuxt/eslint', '@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', '@vite-pwa/nuxt'],
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
      link: [
        { rel: 'icon', type: 'image/svg+xml', href: '/glint-mark.svg' },
        { rel: 'apple-touch-icon', href: '/icons/apple-touch-icon.png' },
      ],
    },
  },
  css: ['~/assets/css/main.css'],
  runtimeConfig: {
    databasePath: '.data/glint.sqlite',
    uploadsDir: 'uploads',
    mailUrl: '',
    mailFrom: 'Glint <no-reply@glint.local>',
    // The address people open Glint at; the only source of links in mail (NUXT_PUBLIC_URL).
    publicUrl: '',
    // Reverse proxies whose X-Forwarded-For is believed, as addresses or CIDR ranges (NUXT_TRUSTED_PROXIES).
    trustedProxies: '',
    session: {
      // Sessions end after 12 hours (the module's default never expires).
      maxAge: 60 * 60 * 12,
      cookie: { sameSite: 'lax', httpOnly: true },
    },
  },
  buildDir: tag ? `.nuxt-${tag}` : '.nuxt',
  // Other pages' code is fetched when a link is touched or focused, not when it scrolls into view:
  // on a phone's slow link the watch's own pictures come first. Offline pages come from the service worker.
  experimental: { defaults: { nuxtLink: { prefetchOn: { visibility: false, interaction: true } } } },
  compatibilityDate: '2025-07-15',
  nitro: {
    output: tag ? { dir: `.output-${tag}` } : undefined,
    experimental: { tasks: true },
    // Weekly digest to leads on Monday 06:00, daily reminders to trainees at 05:00 (server time).
    // Crews' FSRS parameters refitted on Sunday 03:00.
    scheduledTasks: { '0 6 * * 1': ['digests:weekly'], '0 5 * * *': ['digests:daily'], '0 3 * * 0': ['fsrs:fit-crews'] },
    // The fit's child process (server/workers/fit-child.ts) loads the optimizer's native package
    // from the server's node_modules; the server itself never imports it, so its entry file is traced here.
    externals: { external: ['better-sqlite3'], traceInclude: [fitBinding] },
  },
  typescript: { strict: true },
  telemetry: false,
  // Deck uploads (issue 3): bundle the render worker and its codecs' .wasm next to the built server;
  // crews' FSRS fits (issue 18): the fit's child process beside it.
  hooks: {
    'nitro:build:before': (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        const { buildFitChild, buildRenderWorker } = await import('./server/workers/build-worker')
        await buildRenderWorker(nitro.options.output.serverDir)
        await buildFitChild(nitro.options.output.serverDir)
      })
    },
  },
  eslint: { config: { stylistic: true } },
  // Installable app: manifest with the project's own icons; the service worker (Workbox) precaches
  // the app shell and fonts, keeps visited pages for a connection that comes and goes, and keeps
  // the watch's images once fetched (the watch itself is stored in IndexedDB by the page).
  pwa: {
    registerType: 'autoUpdate',
    injectRegister: false,
    manifest: {
      name: 'Glint: recognition drill',
      short_name: 'Glint',
      description: 'Recognition drill for lookouts and spotters.',
      lang: 'en',
      start_url: '/',
      scope: '/',
      display: 'standalone',
      orientation: 'any',
      theme_color: '#0f2a3d',
      background_color: '#f7f9fa',
      icons: [
        { src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
        { src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
        { src: '/icons/maskable-192.png', sizes: '192x192', type: 'image/png', purpose: 'maskable' },
        { src: '/icons/maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
      ],
    },
    workbox: {
      navigateFallback: null,
      // Control from the first visit, so a page opened once reloads with no connection.
      clientsClaim: true,
      skipWaiting: true,
      // json: Nuxt's build manifest (_nuxt/builds), read when a page opens with no connection;
      // offline/index.html (precached as /offline): what a page never kept says with no connection.
      globPatterns: ['**/*.{js,css,woff2,woff,svg,png,json}', 'offline/index.html'],
      cleanupOutdatedCaches: true,
      runtimeCaching: [
        {
          urlPattern: ({ request, url }) => request.mode === 'navigate' && !url.pathname.startsWith('/api/'),
          handler: 'NetworkFirst',
          options: {
            cacheName: 'glint-pages',
            networkTimeoutSeconds: 4,
            expiration: { maxEntries: 40 },
            // Pages kept by useOfflinePages were fetched, not navigated to: another Accept header.
            matchOptions: { ignoreVary: true },
            plugins: [{ handlerDidError: async () => (await caches.match('/offline', { ignoreSearch: true })) ?? Response.error() }],
          },
        },
        {
          urlPattern: ({ url }) => url.pathname.startsWith('/images/') || url.pathname.startsWith('/masks/'),
          handler: 'CacheFirst',
          options: { cacheName: 'glint-watch-images', expiration: { maxEntries: 1500, maxAgeSeconds: 60 * 60 * 24 * 30 } },
        },
      ],
    },
    client: { installPrompt: true },
    devOptions: { enabled: false },
  },
  tailwindcss: { cssPath: false, exposeConfig: false, viewer: false },
})
