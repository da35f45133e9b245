// The fit of a crew's FSRS parameters runs in a child process (server/utils/fit-process.ts), so a
// crash of the optimizer's native code fails that fit and not the process that asked for it.
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { fitInChild, FitProcessEnded } from '../../../server/utils/fit-process'
import { MIN_FIT_CALLS } from '../../../server/core/scheduling/fit'

const DAY_MS = 86_400_000
const source = { filename: resolve('server/workers/fit-child.ts'), execArgv: ['--import', 'tsx'] }
const panics = { filename: resolve('tests/fixtures/fit-child-panics.mjs'), execArgv: [] }

// 20 tracks of 5 calls a day apart: 4 usable calls a track
const logs = Array.from({ length: 100 }, (_, i) => ({
  trackId: `t${i % 20}`,
  calledAt: Date.UTC(2026, 0, 5, 9) + Math.floor(i / 20) * DAY_MS,
  grade: 'sure' as const,
}))

describe('the fit in a child process', () => {
  it('answers with the outcome the child worked out (too few calls: how many more)', async () => {
    const shares: number[] = []
    const out = await fitInChild(logs, { entry: source, onProgress: s => shares.push(s) })
    expect(out).toEqual({ status: 'too-few', calls: 100, tracks: 20, needed: MIN_FIT_CALLS - 80 })
  })

  it('a panic in the optimizer ends only the child: the fit fails with the panic\'s words, and this process fits again after', async () => {
    const error = await fitInChild(logs, { entry: panics }).then(() => null, (e: unknown) => e)
    expect(error).toBeInstanceOf(FitProcessEnded)
    // A Rust panic that cannot unwind calls abort(), which raises SIGABRT (POSIX abort(3)).
    expect((error as FitProcessEnded).signal).toBe('SIGABRT')
    // fsrs-rs's own words for an item with no review after a gap (its dataset.rs).
    expect((error as Error).message).toContain('at least one review with delta_t > 0 is required')
    expect((error as Error).message).toContain('was stopped by the signal SIGABRT')
    // still here, and able to run the next fit
    expect((await fitInChild(logs, { entry: source })).status).toBe('too-few')
  })

  // the time bound and its words are design values
  it('a child that does not finish in time is stopped and the fit fails', async () => {
    const error = await fitInChild(logs, { entry: { filename: resolve('tests/fixtures/fit-child-hangs.mjs'), execArgv: [] }, timeoutMs: 2000 }).then(() => null, (e: unknown) => e)
    expect((error as Error).message).toBe('it took longer than 2 s and was stopped')
  })

  it('the child gets none of the server\'s settings or secrets (least privilege, OWASP)', async () => {
    process.env.NUXT_SESSION_PASSWORD = 'a-secret-the-child-must-not-see'
    try {
      const error = await fitInChild(logs, { entry: { filename: resolve('tests/fixtures/fit-child-env.mjs'), execArgv: [] } }).then(() => null, (e: unknown) => e)
      expect((error as Error).message).toBe('NODE_ENV,PATH')
    }
    finally {
      delete process.env.NUXT_SESSION_PASSWORD
    }
  })
})
