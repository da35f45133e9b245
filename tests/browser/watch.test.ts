// A whole watch by tapping at phone size: exposures checked by their frame counts, the calls found
// in the database afterwards, screenshots of a sighting, the feedback and the summary.
import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { launch, newPage, shot } from '../support/browser'
import { drillTrainee, ensureDrillFixture, FIXTURE_DECK_TITLE, publishedDecks, readDb, TRAINEE_PASSWORD, writeDb } from '../support/drill-fixture'
import type { WatchPack } from '../../shared/types/drill'

const DAY = 86_400_000
let browser: Browser

beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

// Tracks aged in the database: most due with a stability on the 0.5 s and 1 s rungs of the
// exposure ladder (product.md), the rest not due, one left new (until the call).
function ageTracks(userId: string, deckId: string) {
  const keys = readDb(db => db.prepare(`SELECT DISTINCT v.target_type_id AS typeId, v.aspect FROM views v
    JOIN target_types t ON t.id = v.target_type_id JOIN variants x ON x.view_id = v.id WHERE t.deck_id = ? ORDER BY v.aspect, t.name`).all(deckId) as { typeId: string, aspect: string }[])
  const now = Date.now()
  writeDb((db) => {
    const ins = db.prepare(`INSERT INTO tracks (id, user_id, deck_id, target_type_id, aspect, due, stability, difficulty, elapsed_days,
      scheduled_days, learning_steps, reps, lapses, state, last_review) VALUES (?, ?, ?, ?, ?, ?, ?, 5, 10, 10, 0, 3, 0, 2, ?)`)
    keys.slice(0, -1).forEach((k, i) => {
      const stability = i < 5 ? 12 : i < 7 ? 3 : 60
      const due = i < 7 ? now - DAY : now + 30 * DAY
      ins.run(randomBytes(16).toString('base64url'), userId, deckId, k.typeId, k.aspect, due, stability, now - 12 * DAY)
    })
  })
  return keys.length
}

describe('the watch page at 390x844', () => {
  it('runs a whole watch by tapping, with exposures of the computed frame counts, and stores the calls', async () => {
    const fx = await ensureDrillFixture()
    const decks = publishedDecks(fx.crewId)
    const deck = decks.find(d => d.title !== FIXTURE_DECK_TITLE && d.types.length >= 4) ?? decks.find(d => d.id === fx.deckId)!
    const trainee = await drillTrainee(fx.crewId)
    ageTracks(trainee.id, deck.id)
    // The day theme, whatever the local hour (the night theme is the phone issue's).
    writeDb(db => db.prepare('UPDATE users SET night_mode = \'day\' WHERE id = ?').run(trainee.id))

    const { context, page } = await newPage(browser)
    await page.goto('/login')
    await page.getByLabel('E-mail').fill(trainee.email)
    await page.getByLabel('Password').fill(TRAINEE_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(u => !u.pathname.startsWith('/login'))
    await expect.poll(() => page.getByText('Today\'s watch').count()).toBeGreaterThan(0)

    await page.goto('/watch')
    if (await page.locator('#watch-deck').count()) await page.selectOption('#watch-deck', deck.id)
    await expect.poll(() => page.getByTestId('watch-counts').textContent()).toMatch(/7 to refresh · 1 to meet/)
    await page.getByRole('button', { name: 'Start watch' }).click()
    await page.getByTestId('sighting-box').waitFor()
    // Layout shifts from here on, not caused by a tap (Layout Instability API: hadRecentInput).
    await page.evaluate(() => {
      const w = window as unknown as { __shift: number, __during: number }
      w.__shift = 0
      w.__during = 0
      new PerformanceObserver(list => list.getEntries().forEach((e) => {
        const shift = e as unknown as { value: number, hadRecentInput: boolean }
        if (!shift.hadRecentInput) w.__shift += shift.value
      })).observe({ type: 'layout-shift', buffered: false })
    })

    const watchId = readDb(db => (db.prepare('SELECT id FROM watches WHERE user_id = ? ORDER BY created_at DESC').get(trainee.id) as { id: string }).id)
    const pack = (await (await page.request.get(`/api/watches/${watchId}/pack`)).json()) as WatchPack
    const byId = new Map(pack.sightings.map(s => [s.id, s]))
    expect(pack.sightings).toHaveLength(8)

    const shots = new Set<string>()
    for (let n = 0; n < pack.sightings.length; n++) {
      const box = page.getByTestId('sighting-box')
      await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toMatch(/shown|masked/)
      const shownId = (await box.getAttribute('data-sighting-id'))!
      // The page shows a sighting of this watch's pack, and each one once.
      expect(byId.has(shownId), shownId).toBe(true)
      const s = byId.get(shownId)!
      if (s.untilCall) {
        await page.waitForTimeout(700)
        if (!shots.has('sighting')) {
          await shot(page, 'watch-sighting')
          shots.add('sighting')
        }
      }
      else {
        await expect.poll(() => box.getAttribute('data-state'), { timeout: 5000 }).toBe('masked')
      }
      const right = s.choices.find(c => c.id === s.answer.choiceId)!
      await page.getByRole('button', { name: right.label, exact: true }).tap()
      const feedback = page.getByTestId('feedback')
      await feedback.waitFor()
      expect(await feedback.textContent()).toContain(s.answer.name)
      if (!shots.has('feedback')) {
        await shot(page, 'watch-feedback')
        shots.add('feedback')
      }
      shots.add(`done-${s.id}`)
      await page.evaluate(() => {
        const w = window as unknown as { __shift: number, __during: number }
        w.__during = w.__shift
      })
      await feedback.click()
    }
    await page.getByTestId('watch-summary').waitFor()
    await shot(page, 'watch-summary')
    expect(await page.getByTestId('watch-summary').textContent()).toContain('8')

    // Frame counts: framesShown == round(exposureMs / interval) ± 1 (a 500 ms exposure at 60 Hz: 30 frames).
    const frames = await page.evaluate(() => window.__glintFrames ?? [])
    expect(frames).toHaveLength(8)
    let timed = 0
    for (const f of frames) {
      const s = byId.get(f.sightingId)!
      expect(f.frameIntervalMs).toBeGreaterThan(4)
      if (s.untilCall) continue
      timed++
      expect(Math.abs(f.framesShown - Math.round(s.exposureMs / f.frameIntervalMs)), `${s.exposureMs} ms at ${f.frameIntervalMs} ms`).toBeLessThanOrEqual(1)
      if (s.exposureMs === 500 && Math.abs(f.frameIntervalMs - 1000 / 60) < 0.5) expect(Math.abs(f.framesShown - 30)).toBeLessThanOrEqual(1)
    }
    expect(timed).toBe(7)
    expect(pack.sightings.filter(s => s.exposureMs === 500)).toHaveLength(5)

    // The calls are in the database, one per sighting, with the frame counts the page reported.
    const calls = readDb(db => db.prepare('SELECT sighting_id AS s, frames_shown AS f, correct, grade, latency_ms AS l FROM calls WHERE user_id = ?').all(trainee.id) as { s: string, f: number, correct: number, grade: string, l: number }[])
    expect(calls).toHaveLength(8)
    for (const c of calls) {
      expect(c.correct).toBe(1)
      expect(c.l).toBeGreaterThanOrEqual(150)
      expect(c.f).toBe(frames.find(f => f.sightingId === c.s)!.framesShown)
    }
    // No layout shift while the sightings ran (up to the last feedback; the summary may reflow the page).
    expect(await page.evaluate(() => (window as unknown as { __during: number }).__during)).toBeLessThan(0.01)
    await context.close()
  })
})
