import type { Config } from 'tailwindcss'

// Glint's palette: deep sea blue for text and chrome, one amber accent for what needs action,
// and a dim red night theme (class "night" on <html>) that keeps dark adaptation.
export default {
  content: ['./app/**/*.{vue,ts}'],
  darkMode: ['class', '.night'],
  theme: {
    extend: {
      fontFamily: { sans: ['Nunito', 'system-ui', 'sans-serif'] },
      colors: {
        ink: { DEFAULT: '#0f2a3d', soft: '#3b5466', faint: '#6b8190' },
        paper: { DEFAULT: '#f7f9fa', raised: '#ffffff', sunk: '#e8eef2' },
        signal: { DEFAULT: '#c25e00', strong: '#9a4a00', soft: '#fbe9d7' },
        ok: { DEFAULT: '#1f6f43', soft: '#dcf1e4' },
        warn: { DEFAULT: '#8a5a00', soft: '#fff1cc' },
        bad: { DEFAULT: '#a4262c', soft: '#fbe3e4' },
        // Pure reds: no colour above WCAG relative luminance 0.05 (text #800000: 0.046), green and blue 0.
        night: { bg: '#0a0000', panel: '#1a0000', text: '#800000', dim: '#5a0000', line: '#3a0000' },
      },
      // A phone held sideways: wide and short (844x390 and the like).
      screens: { short: { raw: '(orientation: landscape) and (max-height: 560px)' } },
      minHeight: { tap: '3rem' },
      minWidth: { tap: '3rem' },
    },
  },
  plugins: [],
} satisfies Config
