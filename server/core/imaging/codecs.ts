// Decoding and encoding through the @jsquash WASM codecs under Node (main thread or worker_thread).
// Each codec's .wasm is read from disk and compiled once per thread, on first use.
import { readFile } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { basename, dirname, join } from 'node:path'

export type ImageMime = 'image/png' | 'image/jpeg' | 'image/webp'

export interface RgbaImage {
  data: Uint8ClampedArray
  width: number
  height: number
}

export interface WebpOptions {
  /** 0..100, default 80 */
  quality?: number
  /** libwebp effort 0 (fast) .. 6 (small), default 2 */
  method?: number
}

/** Each codec's .wasm, as a path inside node_modules. The built server needs these files. */
export const WASM_FILES = {
  png: '@jsquash/png/codec/pkg/squoosh_png_bg.wasm',
  jpegDecode: '@jsquash/jpeg/codec/dec/mozjpeg_dec.wasm',
  webpDecode: '@jsquash/webp/codec/dec/webp_dec.wasm',
  webpEncode: '@jsquash/webp/codec/enc/webp_enc.wasm',
  webpEncodeSimd: '@jsquash/webp/codec/enc/webp_enc_simd.wasm',
} as const
export type WasmFile = keyof typeof WASM_FILES

let wasmDir: string | null = null
const compiled = new Map<WasmFile, Promise<WebAssembly.Module>>()
const ready = new Map<string, Promise<unknown>>()

/**
 * Where the .wasm files live. With a directory, every file is read from it by its base name
 * (squoosh_png_bg.wasm, mozjpeg_dec.wasm, webp_dec.wasm, webp_enc.wasm, webp_enc_simd.wasm);
 * with null, they are resolved from node_modules. Call before the first decode or encode.
 */
export function configureCodecs(options: { wasmDir?: string | null }): void {
  wasmDir = options.wasmDir ?? null
  compiled.clear()
  ready.clear()
}

/** The path each .wasm is read from under the current configuration. */
export function wasmPath(file: WasmFile): string {
  const spec = WASM_FILES[file]
  if (wasmDir) return join(wasmDir, basename(spec))
  const [scope, name, ...rest] = spec.split('/')
  const require = createRequire(import.meta.url)
  const packageDir = dirname(require.resolve(`${scope}/${name}/package.json`))
  return join(packageDir, ...rest)
}

function compile(file: WasmFile): Promise<WebAssembly.Module> {
  let module = compiled.get(file)
  if (!module) {
    module = (async () => {
      let path = WASM_FILES[file] as string
      try {
        path = wasmPath(file)
        return await WebAssembly.compile(await readFile(path))
      }
      catch (error) {
        throw new Error(`Image codec file ${path} could not be loaded; ship the @jsquash .wasm files with the server or call configureCodecs({ wasmDir })`, { cause: error })
      }
    })()
    compiled.set(file, module)
    module.catch(() => compiled.delete(file))
  }
  return module
}

function once<T>(key: string, start: () => Promise<T>): Promise<T> {
  let promise = ready.get(key) as Promise<T> | undefined
  if (!promise) {
    promise = start()
    ready.set(key, promise)
    promise.catch(() => ready.delete(key))
  }
  return promise
}

async function pngCodec() {
  return once('png', async () => {
    const [decoder, encoder, module] = await Promise.all([
      import('@jsquash/png/decode.js'),
      import('@jsquash/png/encode.js'),
      compile('png'),
    ])
    // Both entry points share one wasm-bindgen instance; initialising it once serves both.
    await decoder.init(module)
    await encoder.init(module)
    return { decode: decoder.default, encode: encoder.default }
  })
}

async function jpegDecoder() {
  return once('jpeg-decode', async () => {
    const [decoder, module] = await Promise.all([import('@jsquash/jpeg/decode.js'), compile('jpegDecode')])
    await decoder.init(module)
    return decoder.default
  })
}

async function webpDecoder() {
  return once('webp-decode', async () => {
    const [decoder, module] = await Promise.all([import('@jsquash/webp/decode.js'), compile('webpDecode')])
    await decoder.init(module)
    return decoder.default
  })
}

async function webpEncoder() {
  return once('webp-encode', async () => {
    const encoder = await import('@jsquash/webp/encode.js')
    // The encoder picks its SIMD build when the engine validates SIMD; give it the matching binary.
    const simdPath = wasmPath('webpEncodeSimd')
    const simd = WebAssembly.validate(await readFile(simdPath).catch(() => new Uint8Array(0)))
    const module = await compile(simd ? 'webpEncodeSimd' : 'webpEncode')
    await encoder.init(module)
    return encoder.default
  })
}

function toArrayBuffer(bytes: Uint8Array): ArrayBuffer {
  if (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer) {
    return bytes.buffer
  }
  return bytes.slice().buffer as ArrayBuffer
}

function toRgba(result: { data: Uint8ClampedArray | Uint8Array, width: number, height: number }): RgbaImage {
  const data = result.data instanceof Uint8ClampedArray ? result.data : new Uint8ClampedArray(result.data.buffer, result.data.byteOffset, result.data.byteLength)
  return { data, width: result.width, height: result.height }
}

// The codecs read `data.buffer` whole, so the pixels must own their buffer exactly.
function ownedPixels(image: RgbaImage): Uint8ClampedArray {
  const { data } = image
  if (data.byteLength !== image.width * image.height * 4) throw new RangeError('RGBA buffer does not match width x height x 4')
  return data.byteOffset === 0 && data.byteLength === data.buffer.byteLength ? data : data.slice()
}

/** Decodes PNG, JPEG or WebP bytes to 8-bit RGBA. */
export async function decodeImage(bytes: Uint8Array, mime: ImageMime): Promise<RgbaImage> {
  const buffer = toArrayBuffer(bytes)
  if (mime === 'image/png') return toRgba(await (await pngCodec()).decode(buffer))
  if (mime === 'image/jpeg') return toRgba(await (await jpegDecoder())(buffer))
  return toRgba(await (await webpDecoder())(buffer))
}

export async function decodeWebp(bytes: Uint8Array): Promise<RgbaImage> {
  return decodeImage(bytes, 'image/webp')
}

export async function encodeWebp(image: RgbaImage, options: WebpOptions = {}): Promise<Uint8Array> {
  const encode = await webpEncoder()
  const input = { data: ownedPixels(image), width: image.width, height: image.height } as unknown as Parameters<typeof encode>[0]
  const out = await encode(input, { quality: options.quality ?? 80, method: options.method ?? 2 })
  return new Uint8Array(out)
}

export async function encodePng(image: RgbaImage): Promise<Uint8Array> {
  const { encode } = await pngCodec()
  const input = { data: ownedPixels(image), width: image.width, height: image.height } as unknown as Parameters<typeof encode>[0]
  return new Uint8Array(await encode(input))
}
