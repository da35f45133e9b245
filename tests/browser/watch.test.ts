// A whole watch by tapping at phone size: exposures checked by their frame counts, the calls found
// in the database afterwards, screenshots of a sighting, the feedback and the summary.
import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { DESKTOP, launch, newPage, passIntroductions, PHONE, shot } from '../support/browser'
import { drillTrainee, ensureWatchFixture, FIXTURE_DECK_TITLE, publishedDecks, readDb, TRAINEE_PASSWORD, writeDb } from '../support/watch-fixture'
import type { IssuedWatch, WatchPack } from '../../shared/types/watch'

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
    const fx = await ensureWatchFixture()
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
      // The one new track is introduced first (issue 15).
      await passIntroductions(page)
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
      await tapOn(page)
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

// Signs a trainee in on a phone-sized page with the day theme and opens the watch on a deck.
async function openWatch(trainee: { id: string, email: string }, deckId: string) {
  writeDb(db => db.prepare('UPDATE users SET night_mode = \'day\' WHERE id = ?').run(trainee.id))
  const { context, page } = await newPage(browser)
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(trainee.email)
  await page.getByLabel('Password').fill(TRAINEE_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(u => !u.pathname.startsWith('/login'))
  await page.goto('/watch')
  if (await page.locator('#watch-deck').count()) await page.selectOption('#watch-deck', deckId)
  return { context, page }
}

// Taps the reveal to go on (a tap in its first 400 ms counts as the end of the call's tap and is
// ignored, so it is repeated until the reveal has gone).
async function tapOn(page: Page) {
  const feedback = page.getByTestId('feedback')
  await expect.poll(async () => {
    if (await feedback.count()) await feedback.click({ timeout: 2000 }).catch(() => {})
    return feedback.count()
  }, { timeout: 10_000 }).toBe(0)
}

// Is the element's box inside the viewport and its image decoded (a picture a person can see)?
const pictureOnScreen = (page: Page, testId: string) => page.getByTestId(testId).evaluate((el) => {
  const img = el as HTMLImageElement
  const r = img.getBoundingClientRect()
  return img.complete && img.naturalWidth > 0 && r.width > 40 && r.top >= 0 && r.bottom <= window.innerHeight
})
const textOnScreen = (page: Page, testId: string) => page.getByTestId(testId).evaluate((el) => {
  const r = el.getBoundingClientRect()
  return r.height > 0 && r.top >= 0 && r.bottom <= window.innerHeight
})

describe('the watch teaches at 390x844 (issue 15)', () => {
  it('introduces a new type before its first timed sighting; the reveal shows picture and name, and both pictures after a wrong call', async () => {
    const fx = await ensureWatchFixture()
    const trainee = await drillTrainee(fx.crewId)
    const { context, page } = await openWatch(trainee, fx.deckId)
    await expect.poll(() => page.getByTestId('watch-counts').textContent()).toMatch(/0 to refresh · 10 to meet/)
    await page.getByRole('button', { name: 'Start watch' }).click()

    // The first thing shown is an introduction, not a sighting: name, features, picture, look-alike.
    const intro = page.getByTestId('introduction')
    await intro.waitFor()
    expect(await page.getByTestId('sighting-box').count()).toBe(0)
    const watchId = readDb(db => (db.prepare('SELECT id FROM watches WHERE user_id = ? ORDER BY created_at DESC').get(trainee.id) as { id: string }).id)
    const pack = (await (await page.request.get(`/api/watches/${watchId}/pack`)).json()) as WatchPack
    const first = pack.introductions![0]!
    expect(await page.getByTestId('introduction-name').textContent()).toContain(first.name)
    for (const v of Object.values(first.features)) expect(await page.getByTestId('introduction-features').textContent()).toContain(v)
    await expect.poll(() => pictureOnScreen(page, 'introduction-picture')).toBe(true)
    expect(await page.getByTestId('introduction-look-alike').textContent()).toContain(first.lookAlike!.name)
    // Beside it, with the features that tell them apart (the fixture's words: each feature whose words differ).
    const [mine, theirs] = await Promise.all(['introduction-picture', 'introduction-look-alike'].map(id => page.getByTestId(id).boundingBox()))
    expect(Math.abs(mine!.y - theirs!.y)).toBeLessThan(2)
    const table = (await page.getByTestId('introduction-differences').textContent())!
    for (const [k, v] of Object.entries(first.features)) {
      if (first.lookAlike!.features[k] !== v) expect(table).toContain(v)
    }
    await page.waitForTimeout(300)
    await shot(page, 'watch-introduction')
    await page.setViewportSize(DESKTOP)
    await shot(page, 'watch-introduction-desktop')
    await page.setViewportSize(PHONE)

    // Read the introductions as they come; each sighting's track must have been introduced before it.
    const introduced = new Set<string>()
    const byId = new Map(pack.sightings.map(s => [s.id, s]))
    const aspectOf = (id: string) => readDb(db => (db.prepare('SELECT aspect FROM sightings WHERE id = ?').get(id) as { aspect: string }).aspect)
    async function nextSighting() {
      for (;;) {
        await page.locator('[data-testid="introduction"], [data-testid="sighting-box"]').first().waitFor()
        if (!(await intro.count())) break
        const id = (await intro.getAttribute('data-intro-id'))!
        const i = pack.introductions!.find(x => x.id === id)!
        introduced.add(`${i.name}|${i.aspect}`)
        await page.getByRole('button', { name: 'Ready: go on' }).click()
        await page.locator(`[data-intro-id="${id}"]`).waitFor({ state: 'detached' })
      }
      const box = page.getByTestId('sighting-box')
      await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toMatch(/shown|masked/)
      const s = byId.get((await box.getAttribute('data-sighting-id'))!)!
      expect(introduced.has(`${s.answer.name}|${aspectOf(s.id)}`), s.answer.name).toBe(true)
      // A person's reaction: a tap sooner than the anticipation floor would be graded a guess.
      await page.waitForTimeout(400)
      return s
    }

    // A right call: the picture comes back unmasked, with the name and the features, until a tap.
    const a = await nextSighting()
    expect(await page.getByTestId('watch-progress').textContent()).toMatch(/Sighting 1 of 10/)
    await page.getByRole('button', { name: a.choices.find(c => c.id === a.answer.choiceId)!.label, exact: true }).tap()
    const feedback = page.getByTestId('feedback')
    await feedback.waitFor()
    expect(await feedback.getAttribute('data-grade')).not.toBe('missed')
    await expect.poll(() => pictureOnScreen(page, 'reveal-picture-answer')).toBe(true)
    expect(await page.getByTestId('feedback-words').textContent()).toContain(a.answer.name)
    expect(await textOnScreen(page, 'feedback-words')).toBe(true)
    expect(await page.getByTestId('sighting-image').evaluate(el => getComputedStyle(el).visibility)).toBe('visible')
    expect(await page.getByTestId('sighting-mask').evaluate(el => getComputedStyle(el).visibility)).toBe('hidden')
    await page.waitForTimeout(300)
    await shot(page, 'watch-reveal-right')
    // No automatic advance by default: still there after 4 s (longer than any earlier feedback stayed).
    await page.waitForTimeout(4000)
    expect(await feedback.count()).toBe(1)
    await tapOn(page)

    // A wrong call: what was called, and both pictures side by side with the features that differ.
    const b = await nextSighting()
    const wrong = b.choices.find(c => c.id !== b.answer.choiceId)!
    await page.getByRole('button', { name: wrong.label, exact: true }).tap()
    await feedback.waitFor()
    expect(await feedback.getAttribute('data-grade')).toBe('missed')
    expect(await page.getByTestId('feedback-words').textContent()).toMatch(new RegExp(`You called ${wrong.label}\\. It was ${b.answer.name}`))
    await expect.poll(() => pictureOnScreen(page, 'reveal-picture-answer')).toBe(true)
    await expect.poll(() => pictureOnScreen(page, 'reveal-picture-called')).toBe(true)
    const boxes = await Promise.all(['reveal-picture-answer', 'reveal-picture-called'].map(id => page.getByTestId(id).boundingBox()))
    // Beside each other: the same row, no overlap.
    expect(Math.abs(boxes[0]!.y - boxes[1]!.y)).toBeLessThan(2)
    expect(boxes[0]!.x + boxes[0]!.width).toBeLessThanOrEqual(boxes[1]!.x + 1)
    await page.waitForTimeout(300)
    await shot(page, 'watch-reveal-wrong')
    await page.setViewportSize(DESKTOP)
    await shot(page, 'watch-reveal-wrong-desktop')
    await page.setViewportSize(PHONE)
    await tapOn(page)

    // The miss brings a re-show: "Sighting n of 10" keeps its total and counts the re-show apart.
    await nextSighting()
    expect(await page.getByTestId('watch-progress').textContent()).toMatch(/Sighting 3 of 10\s*· 1 re-show to come/)
    await context.close()
  })

  it('offers a practice when nothing is due, with the next due time in words, and its calls are stored', async () => {
    const fx = await ensureWatchFixture()
    const trainee = await drillTrainee(fx.crewId)
    // Tracks made by watches until none is new (other test files may add to the shared fixture deck),
    // then all called before and due in 8 days (not due today).
    const now = Date.now()
    for (let i = 0; i < 6; i++) {
      const w = await trainee.client.post<IssuedWatch>('/api/watches', { deckId: fx.deckId })
      expect(w.status).toBe(200)
      writeDb((db) => {
        db.prepare('UPDATE watches SET status = \'closed\' WHERE user_id = ?').run(trainee.id)
        db.prepare('UPDATE tracks SET reps = 3, state = 2, stability = 10, difficulty = 5, due = ?, last_review = ? WHERE user_id = ?').run(now + 8 * DAY + 3_600_000, now - 2 * DAY, trainee.id)
      })
      const today = await trainee.client.get<{ decks: { deckId: string, due: number, new: number }[] }>('/api/watches/today')
      const deck = today.body.decks.find(d => d.deckId === fx.deckId)!
      if (deck.new === 0 && deck.due === 0) break
    }
    const { context, page } = await openWatch(trainee, fx.deckId)
    await expect.poll(() => page.getByTestId('watch-counts').textContent()).toMatch(/Nothing due · practice of 10 sightings available/)
    // Relative time in the browser's locale (en-US here): Intl.RelativeTimeFormat's "in 8 days" (ECMA-402).
    expect(await page.getByTestId('watch-next-due').textContent()).toMatch(/Next due in 8 days/)
    await shot(page, 'watch-practice-offer')
    await page.getByRole('button', { name: 'Start practice (10 sightings)' }).click()
    const box = page.getByTestId('sighting-box')
    await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toMatch(/shown|masked/)
    expect(await page.getByTestId('watch-progress').textContent()).toMatch(/Sighting 1 of 10/)
    expect(await page.getByText(/Practice ·/).count()).toBe(1)
    await page.waitForTimeout(300)
    await shot(page, 'watch-practice')
    const watchId = readDb(db => (db.prepare('SELECT id FROM watches WHERE user_id = ? ORDER BY created_at DESC').get(trainee.id) as { id: string }).id)
    expect(readDb(db => (db.prepare('SELECT practice FROM watches WHERE id = ?').get(watchId) as { practice: number }).practice)).toBe(1)
    const pack = (await (await page.request.get(`/api/watches/${watchId}/pack`)).json()) as WatchPack
    const shownId = await box.getAttribute('data-sighting-id')
    const s = pack.sightings.find(x => x.id === shownId)!
    await page.getByRole('button', { name: s.choices.find(c => c.id === s.answer.choiceId)!.label, exact: true }).tap()
    await page.getByTestId('feedback').waitFor()
    const calls = readDb(db => db.prepare('SELECT grade, track_id AS t FROM calls WHERE sighting_id = ?').all(s.id) as { grade: string, t: string }[])
    expect(calls).toHaveLength(1)
    // Scheduled as an early review: the track's reps went from 3 to 4.
    expect(readDb(db => (db.prepare('SELECT reps FROM tracks WHERE id = ?').get(calls[0]!.t) as { reps: number }).reps)).toBe(4)

    // The home page and the watch say the same about the deck: 9 of the practice's 10 left (issue 15 item 9).
    await page.goto('/')
    await expect.poll(() => page.getByText(/Fixture drill deck \(test\): 9 sightings left in today's watch/).count()).toBe(1)
    await page.goto('/watch')
    if (await page.locator('#watch-deck').count()) await page.selectOption('#watch-deck', fx.deckId)
    await expect.poll(() => page.getByTestId('watch-counts').textContent()).toMatch(/^\s*9 sightings left in today's watch\.\s*$/)
    await context.close()
  })
})
