// Debian's Chromium through playwright-core (never a downloaded browser).
import { mkdirSync } from 'node:fs'
import { chromium } from 'playwright-core'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { inject } from 'vitest'

export const PHONE = { width: 390, height: 844 }
export const DESKTOP = { width: 1366, height: 900 }

export function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  })
}

export async function newPage(browser: Browser, viewport = PHONE): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ viewport, baseURL: inject('baseUrl'), hasTouch: viewport === PHONE, isMobile: viewport === PHONE })
  const page = await context.newPage()
  return { context, page }
}

export async function signIn(page: Page, email: string, password = 'harbour-lantern-42') {
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(u => !u.pathname.startsWith('/login'))
  // The client-side navigation has rendered the next page once the sign-in form is gone.
  await page.locator('form').filter({ has: page.getByLabel('Password') }).waitFor({ state: 'detached' })
}

export async function shot(page: Page, name: string) {
  mkdirSync('screenshots', { recursive: true })
  await page.screenshot({ path: `screenshots/${name}.png`, fullPage: true })
}

/**
 * Reads past the introductions on screen (issue 15: a new track is introduced before its first
 * timed sighting) until a sighting or the summary shows.
 */
export async function passIntroductions(page: Page) {
  for (let i = 0; i < 40; i++) {
    await page.locator('[data-testid="introduction"], [data-testid="sighting-box"], [data-testid="watch-summary"]').first().waitFor({ timeout: 15_000 })
    const intro = page.getByTestId('introduction')
    if (!(await intro.count())) return
    const id = await intro.getAttribute('data-intro-id')
    await page.getByRole('button', { name: 'Ready: go on' }).click()
    await page.locator(`[data-intro-id="${id}"]`).waitFor({ state: 'detached' })
  }
}
