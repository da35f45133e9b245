// Checks an upload's real type and its pixel size from the header, before anything is decoded.
import { imageSize } from 'image-size'
import type { ImageMime } from './codecs'
import { ImageRejected } from './errors'

export interface UploadLimits {
  /** default 15 MB (15 x 1024 x 1024 bytes) */
  maxBytes?: number
  /** default 8000 px on either side */
  maxSide?: number
  /** default 40 megapixels */
  maxPixels?: number
}

export interface UploadInfo {
  mime: ImageMime
  width: number
  height: number
}

export const DEFAULT_UPLOAD_LIMITS: Required<UploadLimits> = {
  maxBytes: 15 * 1024 * 1024,
  maxSide: 8000,
  maxPixels: 40_000_000,
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A]

function startsWith(bytes: Uint8Array, prefix: readonly number[], at = 0): boolean {
  if (bytes.length < at + prefix.length) return false
  for (let i = 0; i < prefix.length; i++) {
    if (bytes[at + i] !== prefix[i]) return false
  }
  return true
}

function ascii(bytes: Uint8Array, from: number, to: number): string {
  return String.fromCharCode(...bytes.subarray(from, to))
}

function readU32(bytes: Uint8Array, at: number): number {
  return ((bytes[at]! << 24) | (bytes[at + 1]! << 16) | (bytes[at + 2]! << 8) | bytes[at + 3]!) >>> 0
}

function megabytes(n: number): string {
  return `${Math.round(n / (1024 * 1024) * 10) / 10} MB`
}

/** The file type from its first bytes, or null when it is none Glint takes. */
export function sniffMime(bytes: Uint8Array): ImageMime | null {
  if (startsWith(bytes, PNG_SIGNATURE)) return 'image/png'
  if (startsWith(bytes, [0xFF, 0xD8, 0xFF])) return 'image/jpeg'
  if (bytes.length >= 12 && ascii(bytes, 0, 4) === 'RIFF' && ascii(bytes, 8, 12) === 'WEBP') return 'image/webp'
  return null
}

function looksLikeText(bytes: Uint8Array): boolean {
  const head = bytes.subarray(0, Math.min(bytes.length, 512))
  let i = 0
  if (startsWith(head, [0xEF, 0xBB, 0xBF])) i = 3
  let printable = 0
  for (let j = i; j < head.length; j++) {
    const b = head[j]!
    if (b === 9 || b === 10 || b === 13 || (b >= 32 && b < 127) || b >= 0x80) printable++
    else return false
  }
  return printable > 0
}

function describeUnknown(bytes: Uint8Array): string {
  const text = looksLikeText(bytes) ? new TextDecoder().decode(bytes.subarray(0, 512)).trimStart().toLowerCase() : null
  if (text !== null && (text.startsWith('<svg') || (text.startsWith('<?xml') && text.includes('<svg')) || text.includes('<svg'))) {
    return 'This is an SVG drawing. Glint takes PNG, JPEG or WebP pictures: export the drawing as PNG first.'
  }
  if (text !== null) return 'This is a text file, not a picture. Glint takes PNG, JPEG or WebP pictures.'
  if (ascii(bytes, 0, 4) === 'GIF8') return 'GIF pictures are not taken. Save the picture as PNG, JPEG or WebP.'
  return 'This file is not a PNG, JPEG or WebP picture.'
}

// Walks the PNG chunks by their lengths (no decoding) so a cut-off file is caught before the codec.
function checkPngStructure(bytes: Uint8Array): void {
  if (bytes.length < 33 || ascii(bytes, 12, 16) !== 'IHDR' || readU32(bytes, 8) !== 13) {
    throw new ImageRejected(422, 'This PNG is damaged: its header is missing or cut off.')
  }
  let at = 8
  while (at + 12 <= bytes.length) {
    const length = readU32(bytes, at)
    const type = ascii(bytes, at + 4, at + 8)
    at += 12 + length
    if (type === 'IEND') return
  }
  throw new ImageRejected(422, 'This PNG is cut off: the file ends before the picture does. Upload the whole file again.')
}

function checkWebpStructure(bytes: Uint8Array): void {
  // RIFF stores the size of what follows its first 8 bytes, little-endian.
  const riffSize = (bytes[4]! | (bytes[5]! << 8) | (bytes[6]! << 16) | (bytes[7]! << 24)) >>> 0
  if (bytes.length < 30 || riffSize + 8 > bytes.length) {
    throw new ImageRejected(422, 'This WebP is cut off or damaged. Upload the whole file again.')
  }
}

// The Huffman-coded JPEG frames: baseline, extended sequential, progressive (ITU-T T.81, table B.1).
const HUFFMAN_SOF: Record<number, 'sequential' | 'progressive'> = { 0xC0: 'sequential', 0xC1: 'sequential', 0xC2: 'progressive' }

function jpegFrameKind(bytes: Uint8Array): 'sequential' | 'progressive' | null {
  let at = 2
  while (at + 4 <= bytes.length && bytes[at] === 0xFF) {
    const marker = bytes[at + 1]!
    if (marker === 0xFF) {
      at++
      continue
    }
    if (HUFFMAN_SOF[marker]) return HUFFMAN_SOF[marker]!
    if (marker === 0xDA || marker === 0xD9) return null
    at += 2 + ((bytes[at + 2]! << 8) | bytes[at + 3]!)
  }
  return null
}

// A Huffman-coded JPEG codes every 8x8 block of its first component: a sequential frame with at
// least a DC difference code and an end-of-block code, a progressive one with at least a DC code
// in its first scan, each code at least one bit long (ITU-T T.81, F.1.2 and G.1.2). A file
// smaller than that for its declared size cannot hold the picture: it is cut off or lies.
function checkJpegHoldsItsSize(bytes: Uint8Array, width: number, height: number): void {
  const kind = jpegFrameKind(bytes)
  if (!kind) return
  const blocks = Math.ceil(width / 8) * Math.ceil(height / 8)
  const minBytes = Math.ceil(blocks * (kind === 'sequential' ? 2 : 1) / 8)
  if (bytes.length < minBytes) {
    throw new ImageRejected(422, `This JPEG declares ${width} x ${height} px but is only ${Math.ceil(bytes.length / 1024)} KB, too small to hold that picture: it is cut off or damaged. Upload the whole file again.`)
  }
}

/**
 * Checks an upload before decoding: size in bytes, real type from magic bytes, pixel size from
 * the header. Throws ImageRejected (400, 413, 415 or 422) with a message for the uploader.
 */
export function inspectUpload(bytes: Uint8Array, limits: UploadLimits = {}): UploadInfo {
  const { maxBytes, maxSide, maxPixels } = { ...DEFAULT_UPLOAD_LIMITS, ...limits }
  if (bytes.length === 0) throw new ImageRejected(400, 'The file is empty. Choose a PNG, JPEG or WebP picture.')
  if (bytes.length > maxBytes) {
    throw new ImageRejected(413, `The file is ${megabytes(bytes.length)}; the limit is ${megabytes(maxBytes)}. Save it smaller and try again.`)
  }
  const mime = sniffMime(bytes)
  if (!mime) throw new ImageRejected(415, describeUnknown(bytes))

  if (mime === 'image/png') checkPngStructure(bytes)
  if (mime === 'image/webp') checkWebpStructure(bytes)

  let width: number | undefined
  let height: number | undefined
  try {
    const size = imageSize(bytes)
    width = size.width
    height = size.height
  }
  catch (error) {
    throw new ImageRejected(422, `This ${mime.slice(6).toUpperCase()} file is damaged: its size could not be read.`, { cause: error })
  }
  if (!Number.isInteger(width) || !Number.isInteger(height) || !width || !height || width < 1 || height < 1) {
    throw new ImageRejected(422, `This ${mime.slice(6).toUpperCase()} file is damaged: it declares no picture size.`)
  }
  if (width > maxSide || height > maxSide) {
    throw new ImageRejected(422, `The picture is ${width} x ${height} px; at most ${maxSide} px a side is taken. Scale it down and try again.`)
  }
  if (width * height > maxPixels) {
    throw new ImageRejected(422, `The picture has ${Math.round(width * height / 1e5) / 10} megapixels; at most ${maxPixels / 1e6} are taken. Scale it down and try again.`)
  }
  if (mime === 'image/jpeg') checkJpegHoldsItsSize(bytes, width, height)
  return { mime, width, height }
}
