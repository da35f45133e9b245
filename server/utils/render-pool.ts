// The worker pool (piscina) that decodes and renders uploads off the request thread, with a
// memory bound per worker thread and a time bound per task.
import { availableParallelism } from 'node:os'
import { resolve } from 'node:path'
import { MessageChannel } from 'node:worker_threads'
import { Piscina } from 'piscina'
import type { Backdrop } from '../core/imaging/render'
import type { RenderResult, RenderTask } from '../workers/render-worker'
import { builtWorker } from './worker-file'

export const RENDER_TIMEOUT_MS = 20_000
// V8 heap bound of each worker thread; the pixel limit checked before decoding (sniff.ts)
// bounds the decoded buffers, which live outside this heap.
export const WORKER_HEAP_MB = 192

let pool: Piscina<RenderTask, RenderResult> | undefined

// From the sources (no built worker) the TypeScript worker runs through tsx.
function renderWorkerFile(): { filename: string, execArgv: string[] } {
  if (process.env.GLINT_RENDER_WORKER) return { filename: resolve(process.env.GLINT_RENDER_WORKER), execArgv: [] }
  const built = builtWorker('render-worker')
  return built ? { filename: built, execArgv: [] } : { filename: resolve('server/workers/render-worker.ts'), execArgv: ['--import', 'tsx'] }
}

export function renderThreads() {
  const wanted = Number(process.env.GLINT_RENDER_THREADS)
  return Number.isInteger(wanted) && wanted > 0 ? wanted : Math.max(1, Math.min(4, availableParallelism()))
}

export function renderPool() {
  if (!pool) {
    const { filename, execArgv } = renderWorkerFile()
    const threads = renderThreads()
    pool = new Piscina<RenderTask, RenderResult>({
      filename,
      execArgv,
      minThreads: threads,
      maxThreads: threads,
      idleTimeout: 5 * 60_000,
      maxQueue: 400,
      resourceLimits: { maxOldGenerationSizeMb: WORKER_HEAP_MB, maxYoungGenerationSizeMb: 32, stackSizeMb: 4 },
    })
  }
  return pool
}

/** Ends the pool's threads (tests; the server's pool lives as long as the process). */
export async function closeRenderPool() {
  const p = pool
  pool = undefined
  await p?.destroy()
}

export class RenderTimeout extends Error {
  constructor() {
    super(`Processing took longer than ${RENDER_TIMEOUT_MS / 1000} s, so it was stopped. The picture may be damaged or too complex; try a smaller one.`)
    this.name = 'RenderTimeout'
  }
}

/**
 * Runs one upload through the pool. The time bound starts when a worker takes the task (not
 * while it waits in the queue); on timeout the task is aborted and piscina ends its thread.
 */
export function renderInPool(bytes: Uint8Array, opts: { backdrop: Backdrop, seed: number, timeoutMs?: number, onStart?: () => void, onProgress?: (p: number) => void }): Promise<RenderResult> {
  const { port1, port2 } = new MessageChannel()
  const controller = new AbortController()
  let timer: NodeJS.Timeout | undefined
  let started = false
  port1.on('message', (m: { progress?: number }) => {
    if (!started) {
      started = true
      opts.onStart?.()
      timer = setTimeout(() => controller.abort(new RenderTimeout()), opts.timeoutMs ?? RENDER_TIMEOUT_MS)
    }
    if (typeof m.progress === 'number') opts.onProgress?.(m.progress)
  })
  const copy = bytes.slice()
  return renderPool().run({ bytes: copy, backdrop: opts.backdrop, seed: opts.seed, port: port2 }, { transferList: [port2, copy.buffer], signal: controller.signal })
    .catch((e: unknown) => {
      if (controller.signal.aborted) throw new RenderTimeout()
      throw e
    })
    .finally(() => {
      clearTimeout(timer)
      port1.close()
    })
}
