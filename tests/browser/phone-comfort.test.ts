// Phone comfort and the night theme (issue 6): no horizontal scroll at 360 px, tap targets of at
// least 48 CSS px (WCAG 2.2 SC 2.5.8 asks 24 px; 48 px is Material Design's touch target), the
// theme set explicitly (never by the hour), the sighting image through the night filter once in night mode.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { crewIdOf, freshPerson } from '../support/client'
import { launch, passIntroductions, PHONE, shot, signIn } from '../support/browser'

let browser: Browser

beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

// Every visible control in the header and the page (not the footer's text) with its size.
function smallTargets(page: Page) {
  return page.evaluate(() => {
    const out: string[] = []
    for (const el of document.querySelectorAll<HTMLElement>('header a, header button, main a, main button, main select, main input:not([type=radio]):not([type=checkbox]), main label:has(input[type=radio]), main label:has(input[type=checkbox])')) {
      const r = el.getBoundingClientRect()
      if (r.width === 0 || r.height === 0 || getComputedStyle(el).visibility === 'hidden') continue
      if (r.height < 47.5 || r.width < 47.5) out.push(`${el.tagName} "${(el.textContent ?? '').trim().slice(0, 30)}" ${Math.round(r.width)}x${Math.round(r.height)}`)
    }
    return out
  })
}

async function setTheme(page: Page, nightMode: 'day' | 'night') {
  const r = await page.request.patch('/api/auth/me', { data: { nightMode }, headers: { origin: inject('baseUrl') } })
  expect(r.status()).toBe(200)
}

describe('the phone at 360 px and 390 px', () => {
  it('has no horizontal scroll and 48 px tap targets on home, the watch and settings at 360x740', async () => {
    const p = await freshPerson('trainee', await crewIdOf('trainee@glint.demo'))
    const context = await browser.newContext({ viewport: { width: 360, height: 740 }, baseURL: inject('baseUrl'), hasTouch: true, isMobile: true })
    const page = await context.newPage()
    await signIn(page, p.email, p.password)
    await setTheme(page, 'day')
    for (const path of ['/', '/watch', '/settings']) {
      await page.goto(path)
      await page.waitForLoadState('networkidle')
      const { scroll, width } = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, width: window.innerWidth }))
      expect(scroll, path).toBeLessThanOrEqual(width)
      expect(await smallTargets(page), path).toEqual([])
    }
    await page.goto('/watch')
    await page.getByRole('button', { name: /Start watch/ }).click()
    await passIntroductions(page)
    await page.getByTestId('sighting-box').waitFor()
    expect(await smallTargets(page), 'a running sighting').toEqual([])
    expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true)
    // touch-action: manipulation (no double-tap zoom delay) and text sized in rem from the root.
    expect(await page.evaluate(() => getComputedStyle(document.body).touchAction)).toBe('manipulation')
    await context.close()
  })

  it('shows the watch in the day and the night theme, chosen in settings, the image dimmed red once at night', async () => {
    const p = await freshPerson('trainee', await crewIdOf('trainee@glint.demo'))
    const context = await browser.newContext({ viewport: PHONE, baseURL: inject('baseUrl'), hasTouch: true, isMobile: true })
    const page = await context.newPage()
    await signIn(page, p.email, p.password)
    await setTheme(page, 'day')
    await page.goto('/watch')
    expect(await page.evaluate(() => document.documentElement.classList.contains('night'))).toBe(false)
    await page.getByRole('button', { name: /Start watch/ }).click()
    await passIntroductions(page)
    const box = page.getByTestId('sighting-box')
    await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toMatch(/shown/)
    await page.waitForTimeout(300)
    await shot(page, 'phone-watch-day')

    // Night chosen in /settings: applied at once, kept on the server and on the phone.
    await page.goto('/settings')
    await page.getByLabel('Night', { exact: true }).check()
    await expect.poll(() => page.evaluate(() => document.documentElement.classList.contains('night'))).toBe(true)
    await expect.poll(() => page.getByText('Saved.').count()).toBe(1)
    expect(await page.evaluate(() => localStorage.getItem('glint-night'))).toBe('night')
    expect((await (await page.request.get('/api/auth/me')).json()).nightMode).toBe('night')
    await shot(page, 'phone-settings')

    await page.goto('/watch')
    expect(await page.evaluate(() => document.documentElement.classList.contains('night'))).toBe(true)
    await page.getByRole('button', { name: /Go on with the watch|Start watch/ }).click()
    await passIntroductions(page)
    await expect.poll(() => box.getAttribute('data-state'), { timeout: 10_000 }).toMatch(/shown/)
    await page.waitForTimeout(300)
    // Issue 15, item 6: the picture goes through the dim red rendering once (the sighting box's
    // filter), nothing else blends it; the pixels are checked in show-true.test.ts (WCAG luminance).
    const filters = await page.evaluate(() => {
      const img = document.querySelector('[data-testid=sighting-image] img')
      const chain: string[] = []
      for (let el: Element | null = img; el; el = el.parentElement) {
        const cs = getComputedStyle(el)
        chain.push(`${cs.filter}|${cs.mixBlendMode}|${cs.backdropFilter}`)
      }
      return { found: !!img, chain }
    })
    expect(filters.found).toBe(true)
    expect(filters.chain.filter(f => f.includes('#glint-night'))).toHaveLength(1)
    for (const f of filters.chain) expect(f).toMatch(/^(none|url\(".*#glint-night"\))\|normal\|none$/)
    await shot(page, 'phone-watch-night')
    await context.close()
  })
})
