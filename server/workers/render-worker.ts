// The piscina task that decodes and renders one upload, off the server's request thread.
// Built to .output*/server/workers/render-worker.mjs (see build-worker.ts); under tsx it runs as is.
import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import type { MessagePort } from 'node:worker_threads'
import { configureCodecs } from '../core/imaging/codecs'
import { isImageRejected } from '../core/imaging/errors'
import { processImage } from '../core/imaging/pipeline'
import type { Backdrop } from '../core/imaging/render'

export interface RenderTask {
  bytes: Uint8Array
  backdrop: Backdrop
  seed: number
  /** receives { progress } messages while the task runs */
  port?: MessagePort
}

export interface RenderedFile {
  condition: string
  size: number
  width: number
  height: number
  bytes: number
  contrast: number
  sha256: string
  webp: Uint8Array
}

export type RenderResult
  = | { ok: true, source: { mime: string, width: number, height: number, sha256: string }, method: string, renderings: RenderedFile[] }
    | { ok: false, status: number, message: string }

// The built worker ships the codecs' .wasm files beside it; from the sources they come from node_modules.
const here = dirname(fileURLToPath(import.meta.url))
const wasmDir = join(here, 'wasm')
configureCodecs({ wasmDir: existsSync(wasmDir) ? wasmDir : null })

export default async function render(task: RenderTask): Promise<RenderResult> {
  const { port } = task
  port?.postMessage({ progress: 0 })
  try {
    const result = await processImage(task.bytes, {
      backdrop: task.backdrop,
      seed: task.seed,
      onProgress: done => port?.postMessage({ progress: done }),
    })
    return {
      ok: true,
      source: result.source,
      method: result.method,
      renderings: result.renderings.map(r => ({
        condition: r.condition, size: r.size, width: r.width, height: r.height, bytes: r.bytes, contrast: r.contrast, sha256: r.sha256, webp: r.webp,
      })),
    }
  }
  catch (error) {
    if (isImageRejected(error)) return { ok: false, status: error.status, message: error.message }
    throw error
  }
  finally {
    port?.close()
  }
}
