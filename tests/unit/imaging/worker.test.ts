import { createRequire } from 'node:module'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { Worker } from 'node:worker_threads'
import { describe, expect, it } from 'vitest'

const codecs = fileURLToPath(new URL('../../../server/core/imaging/codecs.ts', import.meta.url))
// tsx loads the TypeScript module inside the worker, as the built server's bundle would be loaded.
const tsxApi = pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href.replace(/\.cjs$/, '.mjs')

describe('codecs inside a worker_thread', () => {
  it('encodes and decodes WebP in a worker', async () => {
    const source = `
      import { parentPort } from 'node:worker_threads'
      import { tsImport } from ${JSON.stringify(tsxApi)}
      try {
        const { encodeWebp, decodeWebp } = await tsImport(${JSON.stringify(codecs)}, import.meta.url)
        const data = new Uint8ClampedArray(48 * 32 * 4).fill(200)
        const webp = await encodeWebp({ data, width: 48, height: 32 })
        const back = await decodeWebp(webp)
        parentPort.postMessage({ width: back.width, height: back.height, riff: String.fromCharCode(...webp.subarray(0, 4)) })
      }
      catch (error) {
        parentPort.postMessage({ error: String(error) })
      }
    `
    const worker = new Worker(new URL(`data:text/javascript,${encodeURIComponent(source)}`))
    const message = await new Promise<Record<string, unknown>>((resolve, reject) => {
      worker.once('message', resolve)
      worker.once('error', reject)
    })
    await worker.terminate()
    expect(message).toEqual({ width: 48, height: 32, riff: 'RIFF' })
  }, 30_000)
})
