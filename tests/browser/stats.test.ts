// The lead's crew table and a person page at desktop size, the trainee's own progress on a phone.
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'
import { crewIdOf, signedIn } from '../support/client'
import type { CrewConfusions, CrewStats } from '../../shared/types/stats'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

const seconds = (s: string) => (s.trim() === '—' ? Number.POSITIVE_INFINITY : Number.parseFloat(s))

describe('the crew table (lead, desktop)', () => {
  it('sorts by median, filters by deck, shows the heat map and opens a person page with charts', async () => {
    const crewId = await crewIdOf('lead@glint.demo')
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'lead@glint.demo')
    await page.goto(`/crews/${crewId}`)
    await page.getByRole('heading', { name: 'Trainees' }).waitFor()
    const table = page.getByRole('table', { name: /Trainees of the crew/ })
    const rows = table.locator('tbody tr', { has: page.locator('th[scope=row]') })
    // The page shows the server's rows (the demo crew has several trainees), one row each.
    const api = (await (await signedIn('lead@glint.demo')).get(`/api/crews/${crewId}/stats`)).body as CrewStats
    expect(api.rows.length).toBeGreaterThan(1)
    await expect.poll(() => rows.count()).toBe(api.rows.length)

    const median = table.getByRole('columnheader', { name: /Median/ })
    await median.getByRole('button').click()
    await expect.poll(() => median.getAttribute('aria-sort')).toBe('ascending')
    // Cells after the name: ready, right, median (issue 17, item 9: what a lead reads first).
    const values = (await rows.evaluateAll(trs => trs.map(tr => tr.querySelectorAll('td')[2]?.textContent ?? ''))).map(seconds)
    expect(values).toEqual([...values].sort((a, b) => a - b))
    await median.getByRole('button').click()
    await expect.poll(() => median.getAttribute('aria-sort')).toBe('descending')

    // Filter by the first deck of the crew: the request carries it and the table stays.
    const deck = page.getByLabel('Deck')
    const options = await deck.locator('option').evaluateAll(os => os.map(o => (o as HTMLOptionElement).value).filter(Boolean))
    // The demo crew drills at least one published deck (server/seed/decks.ts).
    expect(options).toEqual(api.decks.map(d => d.id))
    const answered = page.waitForResponse(r => r.url().includes('/stats?') && r.url().includes(`deckId=${options[0]}`))
    const confAnswered = page.waitForResponse(r => r.url().includes('/confusions') && r.url().includes(`deckId=${options[0]}`))
    await deck.selectOption(options[0]!)
    const filtered = await (await answered).json() as CrewStats
    const conf = await (await confAnswered).json() as CrewConfusions
    expect(filtered.filters.deckId).toBe(options[0])
    // As many rows read "ready" as the server found ready on that deck.
    await expect.poll(() => rows.count()).toBe(filtered.rows.length)
    const readyCells = await rows.evaluateAll(trs => trs.map(tr => tr.querySelectorAll('td')[0]?.textContent?.trim() ?? ''))
    expect(readyCells.filter(t => t.includes('✓')).length).toBe(filtered.rows.filter(r => r.ready).length)
    expect(await page.getByRole('link', { name: 'Download CSV' }).getAttribute('href')).toMatch(/stats\.csv/)
    await shot(page, 'stats-crew-table')

    const heat = page.locator('section', { has: page.locator('#conf-h') })
    await heat.scrollIntoViewIfNeeded()
    // Each pair of the deck's target types shows the count the server sent for it.
    expect(conf.types.length).toBeGreaterThan(1)
    const n = conf.types.length
    const cells = await heat.locator('tbody tr').evaluateAll((trs, n) => trs.map(tr => [...tr.querySelectorAll('td')].slice(0, n).map(td => Number(td.textContent))), n)
    expect(cells).toEqual(conf.counts)
    await shot(page, 'stats-confusions')

    await rows.first().locator('th a').click()
    await page.waitForURL(/\/people\//)
    await page.getByRole('heading', { name: 'Recognition speed over time' }).waitFor()
    await expect.poll(() => page.locator('canvas').count(), { timeout: 10_000 }).toBeGreaterThanOrEqual(1)
    expect(await page.getByText('The numbers of this chart, by day').count()).toBe(1)
    await shot(page, 'stats-person')
    await context.close()
  })
})

describe('offline calls in the crew\'s standard (issue 14, item 2)', () => {
  it('shows the offline column and the setting, off by default (product.md, "Offline"), on a phone and a desktop', async () => {
    const crewId = await crewIdOf('lead@glint.demo')
    for (const [viewport, name] of [[PHONE, 'phone'], [DESKTOP, 'desktop']] as const) {
      const { context, page } = await newPage(browser, viewport)
      await signIn(page, 'lead@glint.demo')
      await page.goto(`/crews/${crewId}`)
      const table = page.getByRole('table', { name: /Trainees of the crew/ })
      await table.getByRole('columnheader', { name: /Offline/ }).waitFor()
      expect(await page.getByText('Calls graded offline do not count.').count()).toBe(1)
      await page.goto(`/crews/${crewId}/members`)
      const box = page.getByRole('checkbox', { name: /Offline calls count toward readiness/ })
      await box.waitFor()
      expect(await box.isChecked()).toBe(false)
      await box.scrollIntoViewIfNeeded()
      await shot(page, `crew-standard-offline-${name}`)
      await context.close()
    }
  })
})

describe('your progress (trainee, phone)', () => {
  it('opens from the home card, draws the charts and fits the phone', async () => {
    const { context, page } = await newPage(browser, PHONE)
    await signIn(page, 'trainee@glint.demo')
    await page.getByRole('link', { name: 'See your progress' }).click()
    await page.waitForURL(/\/people\/me/)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('Your progress')
    expect(await page.getByRole('checkbox', { name: /E-mail me/ }).count()).toBe(1)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await shot(page, 'stats-person-phone')
    await context.close()
  })
})
