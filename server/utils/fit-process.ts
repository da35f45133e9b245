// Runs one fit of FSRS parameters in a child process (server/workers/fit-child.ts), so that a crash
// of the optimizer's native code (an abort, not an exception) ends that fit and never the server.
import { fork } from 'node:child_process'
import { existsSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import type { FitOutcome, ReviewLog } from '../core/scheduling/fit'
import type { FitMessage, FitRequest } from '../workers/fit-child'

// A fit of a large crew takes a few minutes on one core; past this it is stopped (design value).
export const FIT_TIMEOUT_MS = 20 * 60_000

// The built server carries workers/fit-child.mjs beside its chunks (build-worker.ts); from the
// sources (nuxt dev, tests) the TypeScript entry runs through tsx. GLINT_FIT_WORKER overrides both.
export function fitChildEntry(): { filename: string, execArgv: string[] } {
  if (process.env.GLINT_FIT_WORKER) return { filename: resolve(process.env.GLINT_FIT_WORKER), execArgv: [] }
  let dir = dirname(fileURLToPath(import.meta.url))
  for (let i = 0; i < 4; i++) {
    const built = join(dir, 'workers', 'fit-child.mjs')
    if (existsSync(built)) return { filename: built, execArgv: [] }
    dir = dirname(dir)
  }
  return { filename: resolve('server/workers/fit-child.ts'), execArgv: ['--import', 'tsx'] }
}

/** The fit's process ended before it answered: the reason in words, and what the child last wrote. */
export class FitProcessEnded extends Error {
  constructor(public readonly code: number | null, public readonly signal: NodeJS.Signals | null, detail: string) {
    const how = signal ? `was stopped by the signal ${signal}` : `exited with code ${code}`
    super(`the optimizer's process ${how} before it finished${detail ? `: ${detail}` : ''}`)
    this.name = 'FitProcessEnded'
  }
}

// The first line of a Rust panic's text ("thread '…' panicked at …:\n<message>") is its message.
function panicMessage(stderr: string): string {
  const m = /panicked at [^\n]*\n([^\n]+)/.exec(stderr)
  return m ? m[1]!.trim().slice(0, 300) : ''
}

export interface FitInChildOptions {
  onProgress?: (share: number) => void
  timeoutMs?: number
  entry?: { filename: string, execArgv: string[] }
}

/** Fits in a child process; rejects with FitProcessEnded when that process dies or times out. */
export function fitInChild(logs: readonly ReviewLog[], opts: FitInChildOptions = {}): Promise<FitOutcome> {
  const { filename, execArgv } = opts.entry ?? fitChildEntry()
  return new Promise<FitOutcome>((resolvePromise, reject) => {
    // the child needs none of the server's settings or secrets: only what finds programs and libraries
    const env = { PATH: process.env.PATH ?? '', NODE_ENV: process.env.NODE_ENV ?? 'production' }
    const child = fork(filename, [], { execArgv, env, serialization: 'advanced', stdio: ['ignore', 'ignore', 'pipe', 'ipc'] })
    let stderr = ''
    let settled = false
    const settle = (fn: () => void) => {
      if (settled) return
      settled = true
      clearTimeout(timer)
      fn()
    }
    const limit = opts.timeoutMs ?? FIT_TIMEOUT_MS
    const timer = setTimeout(() => {
      const words = limit < 60_000 ? `${Math.round(limit / 1000)} s` : `${Math.round(limit / 60_000)} minutes`
      settle(() => reject(new Error(`it took longer than ${words} and was stopped`)))
      child.kill('SIGKILL')
    }, limit)
    child.stderr!.on('data', (d: Buffer) => {
      // keep the last few kilobytes: a panic's message is near its end
      stderr = (stderr + d.toString()).slice(-8192)
    })
    child.on('message', (m: FitMessage) => {
      if (m.kind === 'progress') opts.onProgress?.(m.share)
      else if (m.kind === 'done') settle(() => resolvePromise(m.outcome))
      else settle(() => reject(new Error(m.message)))
    })
    child.on('error', error => settle(() => reject(error)))
    // 'close', not 'exit': the child's stderr is read to its end first
    child.on('close', (code, signal) => settle(() => reject(new FitProcessEnded(code, signal, panicMessage(stderr)))))
    const request: FitRequest = { logs: [...logs] }
    child.send(request)
  })
}
