// WCAG 2.2 AA on every page of every role (issue 17, item 15), checked with axe-core (Deque's rule
// engine, which the app itself does not use) at phone (390x844) and desktop size, in the day and the
// night theme. Any violation fails the test, listed by page, rule and element.
// The night theme is dim red on black for dark adaptation (issue 15, "night stays dark"): its text
// stays below a relative luminance of 0.05, where WCAG's 4.5:1 contrast ratio cannot be reached
// (at most (0.05 + 0.05) / (0 + 0.05) = 2). So the night runs take every rule except color-contrast;
// the day runs take every rule.
import axe from 'axe-core'
import type { AxeResults } from 'axe-core'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DESKTOP, PHONE, launch, signIn } from '../support/browser'
import { signedIn } from '../support/client'
import { directPerson, publishedDecks, readDb, TRAINEE_PASSWORD } from '../support/watch-fixture'

type Theme = 'day' | 'night'
type Who = 'anon' | 'trainee' | 'instructor' | 'lead' | 'admin'

// The WCAG 2.0, 2.1 and 2.2 success criteria of levels A and AA that axe-core tests (its tags).
const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22a', 'wcag22aa']
const EMAIL: Record<Exclude<Who, 'anon'>, string> = {
  trainee: 'trainee@glint.demo', instructor: 'instructor@glint.demo', lead: 'lead@glint.demo', admin: 'admin@glint.demo',
}

let browser: Browser
const pages = {} as Record<Who, string[]>

beforeAll(async () => {
  browser = await launch()
  const lead = await signedIn('lead@glint.demo')
  const crewId = (await lead.get('/api/auth/me')).body.crews[0].id as string
  const deck = publishedDecks(crewId)[0]!
  const traineeId = readDb(db => db.prepare('SELECT id FROM users WHERE email = ?').pluck().get(EMAIL.trainee)) as string
  // A check on the crew's deck, and a finished attempt of it by a new trainee, so that the pages to
  // take a check and to read its result exist.
  const instructor = await signedIn(EMAIL.instructor)
  const deckOwner = readDb(db => db.prepare('SELECT u.email FROM decks d JOIN users u ON u.id = d.owner_id WHERE d.id = ?').pluck().get(deck.id)) as string
  const owner = deckOwner === EMAIL.instructor ? instructor : await signedIn(deckOwner)
  const check = await owner.post('/api/checks', {
    deckId: deck.id, title: 'Accessibility walk check (test)', sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.6,
  })
  expect(check.status, check.text).toBe(201)
  const taker = await directPerson(['trainee'], crewId)
  const attempt = await taker.client.post(`/api/checks/${check.body.id}/attempts`)
  expect(attempt.status, attempt.text).toBe(201)
  expect((await taker.client.post(`/api/checks/attempts/${attempt.body.attemptId}/finish`)).status).toBe(200)
  const ownDeck = readDb(db => db.prepare('SELECT d.id FROM decks d JOIN users u ON u.id = d.owner_id WHERE u.email = ? ORDER BY d.title').pluck().get(EMAIL.instructor)) as string
  pages.anon = ['/login', '/reset', '/invite']
  pages.trainee = ['/', '/watch', '/scan', '/baseline', '/people/me', '/checks', `/checks/take/${check.body.id}`, '/settings']
  // A target type of that deck shared with another of the instructor's decks (issue 17, item 5), so
  // both builders show their "Shared with" line, and the second (one type, shown unfolded) its sharing panel.
  const sharedDeck = await instructor.post('/api/decks', { title: `Shared coastal types ${Date.now().toString(36)}`, category: 'mixed' })
  expect(sharedDeck.status, sharedDeck.text).toBe(201)
  const firstType = readDb(db => db.prepare('SELECT id FROM target_types WHERE deck_id = ? ORDER BY name').pluck().get(ownDeck)) as string
  const link = await instructor.post(`/api/decks/${sharedDeck.body.id}/type-links`, { targetTypeId: firstType })
  expect(link.status, link.text).toBe(201)
  pages.instructor = ['/', '/decks', `/decks/${ownDeck}`, `/decks/${sharedDeck.body.id}`, '/scan/drills', '/checks', '/confusions', `/confusions/${ownDeck}`, '/settings']
  pages.lead = ['/', `/crews/${crewId}`, `/crews/${crewId}/members`, `/people/${traineeId}`, '/checks', `/checks/result/${attempt.body.attemptId}`, '/settings']
  pages.admin = ['/', '/admin', '/admin/outbox', '/admin/audit', '/settings']
  // The result page as its own trainee sees it.
  takerLogin = { email: taker.email, path: `/checks/result/${attempt.body.attemptId}` }
}, 120_000)

let takerLogin: { email: string, path: string }

afterAll(async () => {
  // Leave the demo accounts on the theme by the hour, as seeded.
  for (const email of Object.values(EMAIL)) {
    const c = await signedIn(email)
    await c.req('PATCH', '/api/auth/me', { nightMode: 'auto' })
  }
  await browser?.close()
})

// A context whose local time matches the theme (so "auto" agrees), the stored choice set before any
// page script runs, and CSP bypassed only so that axe-core's source can be injected.
async function contextFor(viewport: typeof PHONE, theme: Theme) {
  const context = await browser.newContext({
    viewport, baseURL: inject('baseUrl'), hasTouch: viewport === PHONE, isMobile: viewport === PHONE, bypassCSP: true,
    timezoneId: theme === 'night' ? nightZone() : dayZone(),
  })
  await context.addInitScript((t) => {
    localStorage.setItem('glint-night', t)
  }, theme)
  return context
}

// IANA's Etc/GMT zones carry the opposite sign: Etc/GMT-2 is UTC+2.
function zoneAt(localHour: number) {
  const offset = ((localHour - new Date().getUTCHours() + 36) % 24) - 12
  return offset === 0 ? 'Etc/GMT' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`
}
const dayZone = () => zoneAt(12)
const nightZone = () => zoneAt(0)

async function audit(page: Page, path: string, theme: Theme): Promise<string[]> {
  await page.goto(path)
  await page.waitForLoadState('networkidle')
  await expect.poll(() => page.evaluate(() => document.documentElement.classList.contains('night')), { message: `${path}: ${theme} theme` }).toBe(theme === 'night')
  // Charts and lazy parts settle after hydration.
  await page.waitForTimeout(300)
  await page.evaluate(axe.source)
  const options = { runOnly: { type: 'tag', values: WCAG_TAGS }, rules: theme === 'night' ? { 'color-contrast': { enabled: false } } : {}, resultTypes: ['violations'] }
  const results = await page.evaluate(o => (window as unknown as { axe: { run: (c: Document, o: unknown) => Promise<AxeResults> } }).axe.run(document, o), options)
  return results.violations.flatMap(v => v.nodes.map(n => `${path} · ${v.id} (${v.impact}) · ${n.target.join(' ')} · ${n.failureSummary?.split('\n').slice(1, 2).join('').trim() ?? ''}`))
}

async function walk(who: Who, viewport: typeof PHONE, theme: Theme) {
  const context = await contextFor(viewport, theme)
  const page = await context.newPage()
  const found: string[] = []
  if (who !== 'anon') {
    await signIn(page, EMAIL[who])
    const r = await page.request.patch('/api/auth/me', { data: { nightMode: theme }, headers: { origin: inject('baseUrl') } })
    expect(r.status()).toBe(200)
  }
  for (const path of pages[who]) found.push(...await audit(page, path, theme))
  await context.close()
  return found
}

const sizes = [['phone', PHONE], ['desktop', DESKTOP]] as const
for (const who of ['anon', 'trainee', 'instructor', 'lead', 'admin'] as const) {
  describe(`${who}: WCAG 2.2 AA with axe-core`, () => {
    for (const [size, viewport] of sizes) {
      for (const theme of ['day', 'night'] as const) {
        it(`has no violation on any page at ${size} size in the ${theme} theme`, async () => {
          const found = await walk(who, viewport, theme)
          if (who === 'trainee') {
            // The result of a finished check, as its own trainee reads it.
            const context = await contextFor(viewport, theme)
            const page = await context.newPage()
            await page.goto('/login')
            await page.getByLabel('E-mail').fill(takerLogin.email)
            await page.getByLabel('Password').fill(TRAINEE_PASSWORD)
            await page.getByRole('button', { name: 'Sign in' }).click()
            await page.waitForURL(u => !u.pathname.startsWith('/login'))
            await page.request.patch('/api/auth/me', { data: { nightMode: theme }, headers: { origin: inject('baseUrl') } })
            found.push(...await audit(page, takerLogin.path, theme))
            await context.close()
          }
          expect(found).toEqual([])
        }, 180_000)
      }
    }
  })
}

describe('the confirmation dialog (issue 17, item 4): WCAG 2.2 AA with axe-core', () => {
  for (const theme of ['day', 'night'] as const) {
    it(`has no violation while open, in the ${theme} theme, and takes focus on its safe choice`, async () => {
      const context = await contextFor(DESKTOP, theme)
      const page = await context.newPage()
      await signIn(page, EMAIL.instructor)
      await page.request.patch('/api/auth/me', { data: { nightMode: theme }, headers: { origin: inject('baseUrl') } })
      const found = await audit(page, pages.instructor[2]!, theme)
      await page.getByRole('button', { name: 'Archive' }).click()
      const dialog = page.getByRole('dialog', { name: 'Archive this deck?' })
      await dialog.waitFor()
      // WCAG 2.2 SC 2.4.3 Focus Order: focus moves into the dialog, onto the choice that loses nothing.
      expect(await page.evaluate(() => document.activeElement?.textContent?.trim())).toBe('Keep it')
      await page.evaluate(axe.source)
      const options = { runOnly: { type: 'tag', values: WCAG_TAGS }, rules: theme === 'night' ? { 'color-contrast': { enabled: false } } : {}, resultTypes: ['violations'] }
      const results = await page.evaluate(o => (window as unknown as { axe: { run: (c: unknown, o: unknown) => Promise<AxeResults> } }).axe.run({ include: [['dialog']] }, o), options)
      found.push(...results.violations.flatMap(v => v.nodes.map(n => `dialog · ${v.id} · ${n.target.join(' ')}`)))
      await page.keyboard.press('Escape')
      await dialog.waitFor({ state: 'hidden' })
      await context.close()
      expect(found).toEqual([])
    })
  }
})
