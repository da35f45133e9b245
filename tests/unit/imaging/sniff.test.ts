import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { encodePng } from '../../../server/core/imaging/codecs'
import { ImageRejected } from '../../../server/core/imaging/errors'
import { inspectUpload } from '../../../server/core/imaging/sniff'

function rejection(bytes: Uint8Array, limits = {}): ImageRejected {
  try {
    inspectUpload(bytes, limits)
  }
  catch (error) {
    if (error instanceof ImageRejected) return error
    throw error
  }
  throw new Error('expected the upload to be refused')
}

// PNG layout (W3C PNG specification): 8-byte signature, then chunks of length, type, data, CRC.
function chunk(type: string, data: number[]): number[] {
  const len = data.length
  return [len >>> 24, (len >>> 16) & 255, (len >>> 8) & 255, len & 255, ...[...type].map(c => c.charCodeAt(0)), ...data, 0, 0, 0, 0]
}
function u32(n: number): number[] {
  return [n >>> 24, (n >>> 16) & 255, (n >>> 8) & 255, n & 255]
}
const SIGNATURE = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A]
function pngHeader(width: number, height: number): Uint8Array {
  return new Uint8Array([...SIGNATURE, ...chunk('IHDR', [...u32(width), ...u32(height), 8, 6, 0, 0, 0]), ...chunk('IEND', [])])
}

async function realPng(width: number, height: number): Promise<Uint8Array> {
  const data = new Uint8ClampedArray(width * height * 4)
  for (let i = 0; i < width * height; i++) data.set([i % 251, 30, 90, 255], i * 4)
  return encodePng({ data, width, height })
}

describe('inspectUpload', () => {
  it('reads type and size of a real PNG from its header', async () => {
    expect(inspectUpload(await realPng(37, 21))).toEqual({ mime: 'image/png', width: 37, height: 21 })
  })

  it('refuses an empty file with 400', () => {
    expect(rejection(new Uint8Array(0)).status).toBe(400)
  })

  it('refuses an SVG with 415 and says it is a drawing', () => {
    const svg = new TextEncoder().encode('<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"></svg>')
    const error = rejection(svg)
    expect(error.status).toBe(415)
    expect(error.message).toMatch(/SVG/)
  })

  it('refuses plain text with 415', () => {
    const error = rejection(new TextEncoder().encode('hello, this is not a picture\n'))
    expect(error.status).toBe(415)
    expect(error.message).toMatch(/text/)
  })

  it('refuses a GIF (GIF87a/89a signature) with 415', () => {
    expect(rejection(new TextEncoder().encode('GIF89a\x01\x00\x01\x00\x00\x00\x00')).status).toBe(415)
  })

  it('refuses a file over the byte limit with 413 before looking further', async () => {
    const png = await realPng(64, 64)
    expect(rejection(png, { maxBytes: png.length - 1 }).status).toBe(413)
  })

  it('refuses a PNG header declaring 100000 x 100000 with 422, without decoding', () => {
    const error = rejection(pngHeader(100000, 100000))
    expect(error.status).toBe(422)
    expect(error.message).toMatch(/100000 x 100000/)
  })

  it('refuses more than 40 megapixels under 8000 px a side with 422', () => {
    expect(rejection(pngHeader(7000, 6000)).status).toBe(422)
    expect(inspectUpload(pngHeader(6000, 6000))).toMatchObject({ width: 6000, height: 6000 })
  })

  it('refuses a PNG cut off in its header, and one cut off in its data, with 422', async () => {
    const png = await realPng(64, 64)
    expect(rejection(png.slice(0, 20)).status).toBe(422)
    expect(rejection(png.slice(0, Math.floor(png.length / 2))).status).toBe(422)
  })

  it('refuses a JPEG with garbage after its start-of-image marker with 422', () => {
    const garbage = new Uint8Array(200)
    garbage.set([0xFF, 0xD8, 0xFF])
    for (let i = 3; i < garbage.length; i++) garbage[i] = (i * 37) & 0x7F
    expect(rejection(garbage).status).toBe(422)
  })

  it('refuses a 3 KB JPEG whose frame header claims 8000 x 5000 px, before decoding (422)', () => {
    // ITU-T T.81 F.1.2: every 8x8 block of a sequential frame carries a DC code and an EOB code of
    // at least one bit each, so 8000 x 5000 px needs at least 625,000 x 2 bits = 156,250 bytes.
    const claim = new Uint8Array(readFileSync(new URL('../../fixtures/images/huge-claim.jpg', import.meta.url)))
    expect(claim.length).toBeLessThan(4096)
    const error = rejection(claim)
    expect(error.status).toBe(422)
    expect(error.message).toMatch(/declares 8000 x 5000 px but is only 4 KB.*cut off or damaged/)
    // The real picture it was made from still passes.
    expect(inspectUpload(new Uint8Array(readFileSync(new URL('../../fixtures/images/valid.jpg', import.meta.url))))).toMatchObject({ mime: 'image/jpeg', width: 480, height: 320 })
  })

  it('refuses a cut-off WebP with 422 (RIFF size larger than the file)', () => {
    const riff = new Uint8Array(40)
    riff.set([...'RIFF'].map(c => c.charCodeAt(0)), 0)
    riff.set([0xFF, 0x10, 0, 0], 4)
    riff.set([...'WEBPVP8 '].map(c => c.charCodeAt(0)), 8)
    expect(rejection(riff).status).toBe(422)
  })
})
