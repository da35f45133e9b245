import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt({
  ignores: ['drizzle/**', 'public/**', 'uploads/**', '.data/**', '.output*/**', '.nuxt*/**', 'screenshots/**'],
}, {
  rules: {
    'vue/multi-word-component-names': 'off',
  },
}, {
  // Tests read loosely typed JSON answers.
  files: ['tests/**'],
  rules: { '@typescript-eslint/no-explicit-any': 'off' },
})
