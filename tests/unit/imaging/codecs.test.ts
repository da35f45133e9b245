import { copyFile, mkdtemp, readFile, rm } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { tmpdir } from 'node:os'
import { basename, dirname, join } from 'node:path'
import { afterEach, describe, expect, it } from 'vitest'
import { configureCodecs, decodeImage, decodeWebp, encodeWebp, WASM_FILES, wasmPath } from '../../../server/core/imaging/codecs'
import { extractSilhouette, maskBounds } from '../../../server/core/imaging/mask'
import { inspectUpload } from '../../../server/core/imaging/sniff'

const require = createRequire(import.meta.url)

// A JPEG made with the mozjpeg encoder shipped in @jsquash/jpeg (a general-purpose library).
async function jpegOf(data: Uint8ClampedArray, width: number, height: number): Promise<Uint8Array> {
  const encoder = await import('@jsquash/jpeg/encode.js')
  const wasm = join(dirname(require.resolve('@jsquash/jpeg/package.json')), 'codec/enc/mozjpeg_enc.wasm')
  await encoder.init(await WebAssembly.compile(await readFile(wasm)))
  const input = { data, width, height } as unknown as Parameters<typeof encoder.default>[0]
  return new Uint8Array(await encoder.default(input, { quality: 90 }))
}

afterEach(() => configureCodecs({ wasmDir: null }))

describe('codecs', () => {
  it('decodes a JPEG to its size and finds a white shape on black in it', async () => {
    const w = 96
    const h = 64
    const data = new Uint8ClampedArray(w * h * 4)
    for (let i = 0; i < w * h; i++) {
      const x = i % w
      const y = Math.floor(i / w)
      const v = x >= 20 && x < 70 && y >= 16 && y < 40 ? 245 : 12
      data.set([v, v, v, 255], i * 4)
    }
    const jpeg = await jpegOf(data, w, h)
    expect(inspectUpload(jpeg)).toEqual({ mime: 'image/jpeg', width: w, height: h })
    const img = await decodeImage(jpeg, 'image/jpeg')
    const s = extractSilhouette(img.data, img.width, img.height)
    expect(s.method).toBe('otsu-light')
    const box = maskBounds(s)!
    expect(Math.abs(box.x - 20)).toBeLessThanOrEqual(1)
    expect(Math.abs(box.width - 50)).toBeLessThanOrEqual(2)
  })

  it('round-trips WebP at the stated size, with pixels close to the input', async () => {
    const data = new Uint8ClampedArray(40 * 30 * 4)
    for (let i = 0; i < 40 * 30; i++) data.set([120, 160, 200, 255], i * 4)
    const back = await decodeWebp(await encodeWebp({ data, width: 40, height: 30 }, { quality: 90 }))
    expect([back.width, back.height]).toEqual([40, 30])
    expect(Math.abs(back.data[0]! - 120)).toBeLessThan(8)
  })

  it('reads the .wasm files from a directory given with configureCodecs', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'glint-wasm-'))
    try {
      for (const file of Object.keys(WASM_FILES) as (keyof typeof WASM_FILES)[]) {
        const from = wasmPath(file)
        await copyFile(from, join(dir, basename(from)))
      }
      configureCodecs({ wasmDir: dir })
      expect(wasmPath('webpDecode')).toBe(join(dir, 'webp_dec.wasm'))
      const data = new Uint8ClampedArray(8 * 8 * 4).fill(255)
      const back = await decodeWebp(await encodeWebp({ data, width: 8, height: 8 }))
      expect(back.width).toBe(8)
    }
    finally {
      await rm(dir, { recursive: true, force: true })
    }
  })

  it('says which file is missing when the directory has no codecs', async () => {
    configureCodecs({ wasmDir: join(tmpdir(), 'glint-no-such-dir') })
    await expect(decodeImage(new Uint8Array([1, 2, 3]), 'image/jpeg')).rejects.toThrow(/mozjpeg_dec\.wasm.*configureCodecs/)
  })
})
