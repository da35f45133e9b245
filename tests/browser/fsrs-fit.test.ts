// The crew's fitted scheduling parameters on screen: an instructor opens them from the crew page,
// starts a fit, watches it finish, and sees both figures, the two charts and one person's two
// (phone and desktop).
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'
import { crewIdOf } from '../support/client'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('how a crew forgets (instructor)', () => {
  for (const [size, viewport] of [['desktop', DESKTOP], ['phone', PHONE]] as const) {
    it(`fits from the page and shows figures and charts (${size})`, async () => {
      const crewId = await crewIdOf('lead@glint.demo')
      const { context, page } = await newPage(browser, viewport)
      await signIn(page, 'instructor@glint.demo')
      await page.goto(`/crews/${crewId}`)
      await page.getByRole('link', { name: 'How this crew forgets' }).click()
      await page.getByRole('heading', { name: 'Fitted parameters' }).waitFor()
      await page.getByRole('button', { name: 'Fit again now' }).click()
      // Both rows of figures hold numbers once the fit is done (log loss and RMSE, four decimals).
      const cells = page.locator('[data-test=fit-figures] tbody td')
      await expect.poll(() => cells.allTextContents(), { timeout: 120_000 }).toEqual([
        expect.stringMatching(/^\d\.\d{4}$/), expect.stringMatching(/^\d\.\d{4}$/),
        expect.stringMatching(/^\d\.\d{4}$/), expect.stringMatching(/^\d\.\d{4}$/),
      ])
      await expect.poll(() => page.locator('[data-test=fit-state]').textContent(), { timeout: 120_000 }).toMatch(/In use: the (default parameters|parameters fitted to this crew)/)
      // the crew's two charts, then the first person with enough calls and their two
      await page.getByRole('heading', { name: 'Each person' }).waitFor()
      await expect.poll(() => page.locator('canvas').count()).toBe(4)
      await shot(page, `fsrs-fit-${size}`)
      await context.close()
    }, 180_000)
  }
})
