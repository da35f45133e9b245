// A short check taken by tapping at phone size (no feedback between sightings, the score at the end),
// then its printable result opened by the crew's lead at desktop size, on screen and print-emulated.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { DESKTOP, launch, newPage, shot, signIn } from '../support/browser'
import { signedIn } from '../support/client'
import { drillTrainee, ensureWatchFixture, readDb, TRAINEE_PASSWORD, writeDb } from '../support/watch-fixture'

let browser: Browser

beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('a check at 390x844, and its printed result', () => {
  it('is taken by tapping with no feedback, scores what the database holds, and prints plainly', async () => {
    const fx = await ensureWatchFixture()
    const instructor = await signedIn('instructor@glint.demo')
    const def = await instructor.post('/api/checks', {
      deckId: fx.deckId, title: 'Harbour look-out check (test)', sightingCount: 5, exposureMs: 400,
      conditions: ['sunlit', 'white-cloud'], aspects: ['beam'], passMark: 0.8,
    })
    expect(def.status, def.text).toBe(201)
    const trainee = await drillTrainee(fx.crewId)
    writeDb(db => db.prepare('UPDATE users SET night_mode = \'day\' WHERE id = ?').run(trainee.id))

    const { context, page } = await newPage(browser)
    await page.goto('/login')
    await page.getByLabel('E-mail').fill(trainee.email)
    await page.getByLabel('Password').fill(TRAINEE_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(u => !u.pathname.startsWith('/login'))
    await page.goto('/checks')
    const card = page.getByTestId('check-to-take').filter({ hasText: 'Harbour look-out check (test)' })
    await expect.poll(() => card.textContent()).toContain('Not taken yet')
    expect(await page.getByRole('note').first().textContent()).toMatch(/timed, taken once, and gives no feedback until the end/)
    await card.getByRole('link', { name: 'Start check' }).tap()
    await page.getByRole('button', { name: 'Begin the check' }).tap()
    await page.getByTestId('sighting-box').waitFor()

    const watchId = readDb(db => (db.prepare('SELECT id FROM watches WHERE user_id = ? AND kind = \'check\'').get(trainee.id) as { id: string }).id)
    const rows = readDb(db => db.prepare('SELECT id, answer_choice_id AS a, choices FROM sightings WHERE watch_id = ? ORDER BY position').all(watchId) as { id: string, a: string, choices: string }[])
    expect(rows).toHaveLength(5)
    // Four of five right: 0.8 meets the pass mark of 0.8 exactly.
    for (let n = 0; n < rows.length; n++) {
      const box = page.getByTestId('sighting-box')
      await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toBe('masked')
      const id = (await box.getAttribute('data-sighting-id'))!
      const row = rows.find(r => r.id === id)!
      expect(await page.getByTestId('check-progress').textContent()).toBe(`${n} of 5 called`)
      if (n === 1) await shot(page, 'checks-take')
      const choices = JSON.parse(row.choices) as { id: string, label: string }[]
      const pick = n === 2 ? choices.find(c => c.id !== row.a)! : choices.find(c => c.id === row.a)!
      await page.getByRole('button', { name: pick.label, exact: true }).tap()
      // No feedback: no choice is marked right or wrong after the call.
      expect(await page.locator('[data-choice-id].\\!bg-ok, [data-choice-id].\\!bg-bad').count()).toBe(0)
      expect(await page.getByTestId('feedback').count()).toBe(0)
    }
    await page.getByTestId('check-finished').waitFor()
    expect(await page.getByTestId('check-score').textContent()).toContain('80 %')
    expect(await page.getByTestId('check-finished').textContent()).toContain('Passed')
    await shot(page, 'checks-finished')
    const noScroll = await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)
    expect(noScroll).toBe(true)
    await context.close()

    const attemptId = readDb(db => (db.prepare('SELECT id FROM check_attempts WHERE user_id = ?').get(trainee.id) as { id: string }).id)
    const lead = await newPage(browser, DESKTOP)
    await signIn(lead.page, 'lead@glint.demo')
    await lead.page.goto(`/checks/result/${attemptId}`)
    await lead.page.getByTestId('check-result').waitFor()
    expect(await lead.page.getByTestId('result-score').textContent()).toContain('80 %')
    expect(await lead.page.getByTestId('result-passed').textContent()).toBe('PASSED')
    expect(await lead.page.locator('tbody tr').count()).toBe(5)
    await lead.page.getByRole('button', { name: 'Sign off this result' }).click()
    await expect.poll(() => lead.page.getByTestId('result-signoff').textContent()).toMatch(/Signed off by .+ on /)
    await shot(lead.page, 'checks-result')

    await lead.page.emulateMedia({ media: 'print' })
    // Printed: no shell navigation, no buttons; black text on white.
    expect(await lead.page.locator('nav[aria-label="Main"]').isVisible()).toBe(false)
    expect(await lead.page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false)
    const colours = await lead.page.evaluate(() => {
      const el = document.querySelector('[data-testid="check-result"]')!
      return { color: getComputedStyle(el).color, body: getComputedStyle(document.body).backgroundColor }
    })
    expect(colours.color).toBe('rgb(0, 0, 0)')
    expect(colours.body).toBe('rgb(255, 255, 255)')
    await shot(lead.page, 'checks-result-print')
    await lead.context.close()
  })

  it('shows the instructor\'s define form with an inline error, and the lead\'s crew attempts with their buttons', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    await page.goto('/checks')
    await page.getByTestId('check-form').waitFor()
    await page.getByLabel('Title').fill('Form check (test)')
    await page.getByLabel('Pass mark (%)').fill('30')
    await page.getByRole('button', { name: 'Define the check' }).click()
    await expect.poll(() => page.locator('#f-check-pass-error').textContent()).toBe('Use a pass mark from 50 to 100 %.')
    await shot(page, 'checks-define')
    await context.close()

    const lead = await newPage(browser, DESKTOP)
    await signIn(lead.page, 'lead@glint.demo')
    await lead.page.goto('/checks')
    await expect.poll(() => lead.page.getByTestId('crew-attempt').count()).toBeGreaterThan(0)
    await shot(lead.page, 'checks-lead')
    await lead.context.close()
  })
})
