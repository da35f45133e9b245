// Writes the noise masks shown after each exposure (public/masks/noise-0..7.webp): blocky grey
// noise at several scales, so no after-image of the silhouette survives (masking by visual noise
// is common practice in brief-exposure experiments, no source). Run: npx tsx scripts/make-masks.ts
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import encode, { init } from '@jsquash/webp/encode.js'
import { mulberry32 } from '../server/core/watch/rng'
import { MASK_COUNT } from '../server/core/watch/plan'

const WIDTH = 480
const HEIGHT = 320

const require = createRequire(import.meta.url)
const wasm = join(dirname(require.resolve('@jsquash/webp/package.json')), 'codec/enc/webp_enc.wasm')
await init(await WebAssembly.compile(readFileSync(wasm)))

mkdirSync('public/masks', { recursive: true })
for (let k = 0; k < MASK_COUNT; k++) {
  const rng = mulberry32(0x6D61736B + k)
  const data = new Uint8ClampedArray(WIDTH * HEIGHT * 4)
  const cells = [4, 12, 32].map((size) => {
    const gw = Math.ceil(WIDTH / size)
    const grid = Array.from({ length: gw * Math.ceil(HEIGHT / size) }, () => rng())
    return { size, gw, grid }
  })
  for (let y = 0; y < HEIGHT; y++) {
    for (let x = 0; x < WIDTH; x++) {
      let v = 0
      for (const c of cells) v += c.grid[Math.floor(y / c.size) * c.gw + Math.floor(x / c.size)]!
      const g = Math.round((v / cells.length) * 255)
      const i = (y * WIDTH + x) * 4
      data[i] = g
      data[i + 1] = g
      data[i + 2] = Math.min(255, g + 12)
      data[i + 3] = 255
    }
  }
  const bytes = await encode({ data, width: WIDTH, height: HEIGHT, colorSpace: 'srgb' } as ImageData, { quality: 60 })
  writeFileSync(`public/masks/noise-${k}.webp`, new Uint8Array(bytes))
}
console.log(`wrote ${MASK_COUNT} masks to public/masks/`)
