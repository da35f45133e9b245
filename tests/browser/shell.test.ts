import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('the shell at phone size (390x844)', () => {
  it('refuses a wrong password inline, then signs a trainee in to a home page with their name and crew', async () => {
    const { context, page } = await newPage(browser, PHONE)
    await page.goto('/')
    await page.waitForURL(/\/login/)
    await shot(page, 'phone-sign-in')
    await page.getByLabel('E-mail').fill('trainee@glint.demo')
    await page.getByLabel('Password').fill('not the password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/do not match/)
    await signIn(page, 'trainee@glint.demo')
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('Nell Farrowby')
    // The demo trainee (server/seed/people.ts): one role, one crew, named under the heading.
    expect((await page.locator('h1 + p').textContent())?.replace(/\s+/g, ' ').trim()).toBe('Trainee — Skerrow Point Station')
    // No horizontal scroll on a phone.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    // The safety caution of product.md is on the page.
    expect(await page.getByRole('note').textContent()).toMatch(/sun/)
    await shot(page, 'phone-home-trainee')
    await context.close()
  })

  it('shows each role its own home, at phone and desktop size', async () => {
    for (const [who, email] of [['lead', 'lead@glint.demo'], ['instructor', 'instructor@glint.demo'], ['admin', 'admin@glint.demo']] as const) {
      for (const [size, viewport] of [['phone', PHONE], ['desktop', DESKTOP]] as const) {
        const { context, page } = await newPage(browser, viewport)
        await signIn(page, email)
        await page.getByRole('heading', { level: 1 }).waitFor()
        if (who === 'admin') expect(await page.getByRole('link', { name: 'People and crews' }).count()).toBe(1)
        else expect(await page.getByRole('heading', { name: 'Your crews' }).count()).toBe(1)
        await shot(page, `${size}-home-${who}`)
        await context.close()
      }
    }
  })

  it('sends a signed-out visitor of a deep link to sign-in and back after', async () => {
    const { context, page } = await newPage(browser, DESKTOP)
    await page.goto('/admin/audit')
    await page.waitForURL(/\/login\?next=/)
    await page.getByLabel('E-mail').fill('admin@glint.demo')
    await page.getByLabel('Password').fill('harbour-lantern-42')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL(u => u.pathname === '/admin/audit')
    await page.getByRole('heading', { level: 1, name: 'Audit log' }).waitFor()
    await context.close()
  })

  it('shows its own 404 page', async () => {
    const { context, page } = await newPage(browser, PHONE)
    await signIn(page, 'trainee@glint.demo')
    const r = await page.goto('/no-such-page')
    expect(r?.status()).toBe(404)
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('Nothing on this bearing')
    await context.close()
  })
})
