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

    // Leave the demo deck as it was: remove the uploaded view.
    await belly.locator('xpath=..').getByRole('button', { name: 'Remove this view' }).click()
    await expect.poll(() => card.getByRole('list', { name: 'Taskavel, Belly, in six conditions' }).count()).toBe(0)
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
    await page.getByLabel('Desired retention').fill('0.5')
    await page.getByRole('button', { name: 'Save the deck' }).click()
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'retention' }).count()).toBe(1)
    expect(await page.getByLabel('Desired retention').getAttribute('aria-invalid')).toBe('true')
    await shot(page, 'decks-new-inline-error')
    page.once('dialog', d => d.accept())
    await page.getByRole('button', { name: 'Delete' }).click()
    await page.waitForURL(/\/decks$/)
    expect(await page.getByRole('link', { name: /Dawn patrol trial/ }).count()).toBe(0)
    await context.close()
  })
})
