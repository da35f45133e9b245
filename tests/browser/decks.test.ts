import Database from 'better-sqlite3'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DESKTOP, launch, shot, signIn } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

// A desktop page whose local time is midday, so the screenshots show the day theme at any hour.
async function newPage(b: Browser, viewport: typeof DESKTOP) {
  const offset = 12 - new Date().getUTCHours()
  // IANA's Etc/GMT zones carry the opposite sign: Etc/GMT-2 is UTC+2.
  const timezoneId = offset === 0 ? 'Etc/GMT' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`
  const context = await b.newContext({ viewport, baseURL: inject('baseUrl'), timezoneId })
  return { context, page: await context.newPage() }
}

// Lazy images load once scrolled into view; walk the page so a full-page screenshot shows them.
async function loadAllImages(page: Page) {
  const height = await page.evaluate(() => document.body.scrollHeight)
  for (let y = 0; y < height; y += 600) {
    await page.evaluate(top => window.scrollTo(0, top), y)
    await page.waitForTimeout(60)
  }
  await page.evaluate(() => window.scrollTo(0, 0))
  await expect.poll(() => page.evaluate(() => [...document.images].every(i => i.complete && i.naturalWidth > 0)), { timeout: 20_000 }).toBe(true)
}

describe('the deck builder at desktop size', () => {
  it('shows a demo deck\'s views in six conditions, and uploads a picture with a progress bar that reaches done', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    await page.getByRole('link', { name: 'Decks', exact: true }).first().click()
    await page.waitForURL(/\/decks$/)
    await page.getByRole('link', { name: /Coastal air picture/ }).click()
    await page.getByRole('heading', { level: 1, name: 'Coastal air picture' }).waitFor()
    // Issue 17 item 5: a deck of 10 types starts folded, one line a type; "Open all" shows every grid.
    const types = new Database(inject('dbPath'), { readonly: true }).prepare(`SELECT t.name FROM target_types t JOIN decks d ON d.id = t.deck_id
      WHERE d.title = 'Coastal air picture' ORDER BY t.name`).pluck().all() as string[]
    expect(await page.getByRole('list', { name: /in six conditions$/ }).count()).toBe(0)
    expect(await page.getByRole('article').count()).toBe(types.length)
    const foldedHeight = await page.evaluate(() => document.body.scrollHeight)
    await shot(page, 'decks-builder-folded')
    await page.getByRole('searchbox', { name: 'Find a target type' }).fill('taskav')
    await expect.poll(() => page.getByRole('article').count()).toBe(types.filter(n => n.toLowerCase().includes('taskav')).length)
    expect(await page.getByRole('status').filter({ hasText: 'for "taskav"' }).textContent()).toContain('Showing 1 of 10 target types for "taskav".')
    expect(await page.getByRole('list', { name: /^Taskavel, .* in six conditions$/ }).count()).toBeGreaterThan(0)
    await shot(page, 'decks-builder-search')
    await page.getByRole('searchbox', { name: 'Find a target type' }).fill('')
    await page.getByRole('button', { name: 'Open all' }).click()
    expect(await page.evaluate(() => document.body.scrollHeight)).toBeGreaterThan(foldedHeight * 3)

    const grid = page.getByRole('list', { name: 'Taskavel, Plan (top), in six conditions' })
    await grid.waitFor()
    expect(await grid.getByRole('img').count()).toBe(6)
    for (const label of ['Backlit', 'Sunlit', 'Dark cloud', 'White cloud', 'Haze', 'Filter goggles']) {
      expect(await grid.getByRole('img', { name: `Taskavel, Plan (top), ${label}` }).count()).toBe(1)
    }
    // Every target type of the deck shows its views' grids.
    expect(await page.getByRole('list', { name: /in six conditions$/ }).count()).toBeGreaterThanOrEqual(8 * 3)
    // No horizontal scroll at desktop size.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(DESKTOP.width)
    await loadAllImages(page)
    await shot(page, 'decks-builder')
    await grid.scrollIntoViewIfNeeded()
    await grid.screenshot({ path: 'screenshots/decks-conditions.png' })

    const card = page.getByRole('article', { name: 'Taskavel' })
    await card.getByText('Upload views').click()
    await card.getByLabel('Aspect of the pictures').selectOption('belly')
    await card.getByLabel('Pictures of Taskavel').setInputFiles('tests/fixtures/images/valid.png')
    const bar = card.getByRole('progressbar', { name: 'valid.png' })
    await bar.waitFor()
    await expect.poll(() => bar.getAttribute('aria-valuetext'), { timeout: 60_000 }).toBe('Done')
    expect(await bar.getAttribute('aria-valuenow')).toBe('100')
    // The new view appears in the grid once its renderings are stored.
    const belly = card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' })
    await belly.waitFor()
    await expect.poll(() => belly.evaluate(el => [...el.querySelectorAll('img')].every(i => i.complete && i.naturalWidth > 0)), { timeout: 20_000 }).toBe(true)
    await card.scrollIntoViewIfNeeded()
    await card.screenshot({ path: 'screenshots/decks-upload-progress.png' })

    // Issue 17 item 4: removing asks first and says what will happen; Cancel keeps the view.
    const dialog = page.getByRole('dialog', { name: 'Remove the belly view of Taskavel?' })
    await belly.locator('xpath=..').getByRole('button', { name: 'Remove this view' }).click()
    await dialog.waitFor()
    expect(await dialog.textContent()).toMatch(/watches no longer show it.*for 30 days/s)
    await dialog.screenshot({ path: 'screenshots/decks-remove-view-confirm.png' })
    await dialog.getByRole('button', { name: 'Cancel' }).click()
    await dialog.waitFor({ state: 'hidden' })
    const viewId = await belly.locator('xpath=..').getAttribute('data-view')
    const viewRows = () => new Database(inject('dbPath'), { readonly: true }).prepare('SELECT count(*) FROM views WHERE id = ?').pluck().get(viewId)
    expect(viewRows()).toBe(1)
    // Confirmed, it leaves at once; Undo puts it back with its renderings.
    await belly.locator('xpath=..').getByRole('button', { name: 'Remove this view' }).click()
    await dialog.getByRole('button', { name: 'Remove the view' }).click()
    await expect.poll(() => card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' }).count()).toBe(0)
    expect(viewRows()).toBe(0)
    await page.getByTestId('removed-view').first().waitFor()
    await shot(page, 'decks-removed-views')
    await page.getByRole('status').getByRole('button', { name: 'Undo' }).click()
    await expect.poll(() => card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' }).count()).toBe(1)
    expect(viewRows()).toBe(1)
    // Leave the demo deck as it was: remove the uploaded view again (it waits in the trash).
    await card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' }).locator('xpath=..').getByRole('button', { name: 'Remove this view' }).click()
    await dialog.getByRole('button', { name: 'Remove the view' }).click()
    await expect.poll(() => card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' }).count()).toBe(0)
    await context.close()
  })

  it('asks before sending a published deck back to draft or archiving it, naming the crews it leaves (issue 17, item 4)', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    await page.goto('/decks')
    await page.getByRole('link', { name: /Coastal air picture/ }).click()
    await page.getByRole('heading', { level: 1, name: 'Coastal air picture' }).waitFor()
    const statusOf = () => (new Database(inject('dbPath'), { readonly: true }).prepare('SELECT status FROM decks WHERE title = ?').pluck().get('Coastal air picture'))
    const crews = new Database(inject('dbPath'), { readonly: true }).prepare(`SELECT c.name FROM deck_crews dc JOIN crews c ON c.id = dc.crew_id
      JOIN decks d ON d.id = dc.deck_id WHERE d.title = ? ORDER BY c.name`).pluck().all('Coastal air picture') as string[]
    expect(crews.length).toBeGreaterThan(0)

    await page.getByRole('button', { name: 'Back to draft' }).click()
    const draft = page.getByRole('dialog', { name: 'Send this deck back to draft?' })
    await draft.waitFor()
    for (const c of crews) expect(await draft.textContent()).toContain(c)
    expect(await draft.textContent()).toContain('stop drilling it')
    await shot(page, 'decks-back-to-draft-confirm')
    await draft.getByRole('button', { name: 'Keep it published' }).click()
    await draft.waitFor({ state: 'hidden' })
    expect(statusOf()).toBe('published')

    await page.getByRole('button', { name: 'Archive' }).click()
    const archive = page.getByRole('dialog', { name: 'Archive this deck?' })
    await archive.waitFor()
    expect(await archive.textContent()).toMatch(/leaves the watches of .*history and check results are kept/s)
    // Esc is a cancel too (the native dialog's cancel event).
    await page.keyboard.press('Escape')
    await archive.waitFor({ state: 'hidden' })
    expect(statusOf()).toBe('published')
    await context.close()
  })

  it('starts a new deck from the list and shows inline errors for out-of-range settings', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await signIn(page, 'instructor@glint.demo')
    await page.goto('/decks')
    await page.getByLabel('Title').fill('Dawn patrol trial')
    await page.getByRole('button', { name: 'Create the deck' }).click()
    await page.waitForURL(/\/decks\/[\w-]{8,}$/)
    await page.getByRole('heading', { level: 1, name: 'Dawn patrol trial' }).waitFor()
    // Issue 17 item 14: Glint's own words for the scheduler's settings; item 8 and WCAG 2.2 SC 3.3.1
    // (Error Identification): every invalid field is flagged at once, each with its own sentence.
    await page.getByLabel('Recall target (%)').fill('50')
    await page.getByLabel('Introductions a day').fill('0')
    await page.getByLabel('Title').fill('D')
    await page.getByRole('button', { name: 'Save the deck' }).click()
    await expect.poll(() => page.getByRole('alert').count()).toBe(3)
    expect(await page.getByRole('alert').filter({ hasText: 'recall target of at least 0.7 (70 %)' }).count()).toBe(1)
    expect(await page.getByRole('alert').filter({ hasText: 'at least 1 introduction a day' }).count()).toBe(1)
    expect(await page.getByRole('alert').filter({ hasText: 'at least 2 characters for the title' }).count()).toBe(1)
    for (const label of ['Recall target (%)', 'Introductions a day', 'Title']) {
      expect(await page.getByLabel(label).getAttribute('aria-invalid'), label).toBe('true')
    }
    expect(await page.getByRole('status').textContent()).toContain('Check the 3 marked fields.')
    // Nothing was saved: the stored deck keeps its defaults (0.9 and 10, product.md).
    const stored = new Database(inject('dbPath'), { readonly: true }).prepare('SELECT title, retention, new_per_day AS n FROM decks WHERE id = ?')
      .get(page.url().split('/').pop()) as { title: string, retention: number, n: number }
    expect(stored).toEqual({ title: 'Dawn patrol trial', retention: 0.9, n: 10 })
    await shot(page, 'decks-new-inline-error')
    // A right value in percent is stored as the share the scheduler reads (85 % = 0.85).
    await page.getByLabel('Recall target (%)').fill('85')
    await page.getByLabel('Introductions a day').fill('6')
    await page.getByLabel('Title').fill('Dawn patrol trial')
    await page.getByRole('button', { name: 'Save the deck' }).click()
    await expect.poll(() => page.getByRole('status').textContent()).toContain('Saved.')
    const saved = new Database(inject('dbPath'), { readonly: true }).prepare('SELECT retention, new_per_day AS n FROM decks WHERE id = ?')
      .get(page.url().split('/').pop()) as { retention: number, n: number }
    expect(saved).toEqual({ retention: 0.85, n: 6 })
    // "1 target type" is singular (CLDR plural rules for English: "one" is exactly 1).
    expect(await page.getByText('0 target types, 0 views.').count()).toBe(1)
    await page.getByRole('button', { name: 'Delete' }).click()
    const del = page.getByRole('dialog', { name: 'Delete this deck?' })
    expect(await del.textContent()).toContain('with its 0 target types and 0 views. This cannot be undone.')
    await del.getByRole('button', { name: 'Delete the deck' }).click()
    await page.waitForURL(/\/decks$/)
    expect(await page.getByRole('link', { name: /Dawn patrol trial/ }).count()).toBe(0)
    await context.close()
  })
})
