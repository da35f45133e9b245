// What the renderer and its pool do with uploads that cannot be rendered: a refusal a person can
// act on (ImageRejected, 422) instead of a NaN contrast or a stack trace, and a time bound a job.
import { fileURLToPath } from 'node:url'
import { afterAll, describe, expect, it } from 'vitest'
import { isImageRejected } from '../../../server/core/imaging/errors'
import { type Coverage, renderCoverage } from '../../../server/core/imaging/render'
import { CONDITIONS } from '../../../shared/utils/conditions'

function field(width: number, height: number, value: (x: number, y: number) => number): Coverage {
  const coverage = new Float32Array(width * height)
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) coverage[y * width + x] = value(x, y)
  return { coverage, width, height }
}

function refusal(run: () => unknown) {
  try {
    run()
  }
  catch (error) {
    return error
  }
  return undefined
}

describe('degenerate renderings', () => {
  // Weber contrast (L_target - L_background) / L_background is defined only with a target
  // luminance and a background luminance above 0 (vision science's definition; shared/utils/contrast.ts).
  it('refuses a target with no pixel half covered (no target luminance) under every condition, with a sentence', () => {
    // Scattered specks at 30 % coverage: what a huge, mostly blank picture leaves at 320 px.
    const specks = field(320, 160, (x, y) => (x % 40 === 7 && y % 20 === 3 ? 0.3 : 0))
    for (const condition of CONDITIONS) {
      const error = refusal(() => renderCoverage(specks, condition, 9))
      expect(isImageRejected(error), condition).toBe(true)
      expect((error as { status: number }).status).toBe(422)
      expect((error as Error).message).toMatch(/too small or too thin.*Crop the picture closer/)
    }
  })

  it('refuses a frame with no background (the target covers it all) instead of throwing a RangeError', () => {
    const error = refusal(() => renderCoverage(field(64, 32, () => 1), 'sunlit', 3))
    expect(isImageRejected(error)).toBe(true)
    expect((error as { status: number }).status).toBe(422)
  })
})

describe('the render pool time bound', () => {
  afterAll(async () => {
    const { closeRenderPool } = await import('../../../server/utils/render-pool')
    await closeRenderPool()
  })

  it('stops a render that never returns at its time bound, ends its thread and takes the next job', async () => {
    process.env.GLINT_RENDER_WORKER = fileURLToPath(new URL('../../fixtures/workers/stub-render-worker.mjs', import.meta.url))
    process.env.GLINT_RENDER_THREADS = '1'
    const { RenderTimeout, renderInPool } = await import('../../../server/utils/render-pool')
    // Design value: the server's bound is 20 s; here 400 ms. The stub never answers, so only the
    // bound can end the job: no upper limit on the time is asserted (speed is `npm run bench`'s).
    const bound = 400
    const started = Date.now()
    const hung = await renderInPool(new Uint8Array(8), { backdrop: 'sky', seed: 1, timeoutMs: bound }).catch((e: unknown) => e)
    const took = Date.now() - started
    expect(hung).toBeInstanceOf(RenderTimeout)
    expect((hung as Error).message).toMatch(/longer than 20 s, so it was stopped/)
    expect(took).toBeGreaterThanOrEqual(bound)
    // One thread only: the next job runs on the thread piscina started in place of the ended one.
    const next = await renderInPool(new Uint8Array(8), { backdrop: 'sky', seed: 2, timeoutMs: 5000 })
    expect(next).toEqual({ ok: false, status: 422, message: 'stub answered seed 2' })
  }, 20_000)
})
