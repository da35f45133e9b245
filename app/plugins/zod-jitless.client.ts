import { z } from 'zod'

// zod 4 probes `new Function` to compile fast parsers; under the CSP (no 'unsafe-eval') the probe
// is refused and reported as a violation, so the phone uses zod's plain parsers.
export default defineNuxtPlugin({
  name: 'zod-jitless',
  enforce: 'pre',
  setup() {
    z.config({ jitless: true })
  },
})
