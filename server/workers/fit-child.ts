// A child process that runs one fit of FSRS parameters and ends. The optimizer's native code can
// abort the process it runs in (a Rust panic does not unwind through napi), so it never runs in the
// server's own process: if this one dies, only that fit fails (server/utils/fit-process.ts).
// Built to .output*/server/workers/fit-child.mjs (build-worker.ts); under tsx it runs as is.
import { fitParameters } from '../core/scheduling/optimize'
import type { FitOutcome, ReviewLog } from '../core/scheduling/fit'

export interface FitRequest { logs: ReviewLog[] }
export type FitMessage
  = | { kind: 'progress', share: number }
    | { kind: 'done', outcome: FitOutcome }
    | { kind: 'error', message: string }

// The server went away: nobody is waiting for this fit.
process.once('disconnect', () => process.exit(0))

const send = (m: FitMessage) => new Promise<void>(resolve => process.send!(m, () => resolve()))

process.once('message', async (request: FitRequest) => {
  try {
    const outcome = await fitParameters(request.logs, (share) => {
      void send({ kind: 'progress', share })
    })
    await send({ kind: 'done', outcome })
  }
  catch (error) {
    await send({ kind: 'error', message: error instanceof Error ? error.message : String(error) })
  }
  process.disconnect()
})
