// Issue 15, "Show it true" (items 4, 6, 7, 8) as a trainee sees it: the silhouette on screen is the
// rendering's own; night keeps every pixel dim and red; a sideways phone needs no scrolling during a
// sighting and its contact report can be sent or closed; the app opens offline after a first visit.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { crewIdOf, freshPerson } from '../support/client'
import { launch, passIntroductions, PHONE, shot, signIn } from '../support/browser'
import { contrastRatio, decodePng, decodeWebp, grey, iou, linear, otsu, relativeLuminance, resampleGrey, side } from '../support/pixels'

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

const LANDSCAPE = { width: 844, height: 390 }

async function phone(viewport = PHONE, options: { serviceWorkers?: 'allow' | 'block' } = {}): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ viewport, baseURL: inject('baseUrl'), hasTouch: true, isMobile: true, serviceWorkers: options.serviceWorkers ?? 'block' })
  return { context, page: await context.newPage() }
}

async function trainee(page: Page, nightMode: 'day' | 'night') {
  const p = await freshPerson('trainee', await crewIdOf('trainee@glint.demo'))
  await signIn(page, p.email, p.password)
  const r = await page.request.patch('/api/auth/me', { data: { nightMode }, headers: { origin: inject('baseUrl') } })
  expect(r.status()).toBe(200)
  return p
}

// A new trainee meets each type in an introduction before its first sighting: read past them.
async function startWatch(page: Page, beforeIntroductions?: () => Promise<void>) {
  await page.goto('/watch')
  await page.getByRole('button', { name: /Start watch|Go on with the watch/ }).click()
  if (beforeIntroductions) {
    await page.getByTestId('introduction').waitFor()
    await beforeIntroductions()
  }
  await passIntroductions(page)
  await page.getByTestId('sighting-box').waitFor()
}

// A new track's sighting stays up until the call: wait for it on screen.
async function shownSighting(page: Page) {
  const box = page.getByTestId('sighting-box')
  await expect.poll(() => box.getAttribute('data-state'), { timeout: 15_000 }).toBe('shown')
  await page.waitForTimeout(300)
  return (await box.getAttribute('data-sighting-id'))!
}

async function callAny(page: Page) {
  await page.getByRole('group', { name: 'Choices' }).getByRole('button').first().tap()
  await page.getByTestId('feedback').waitFor()
}

// The reveal stays until tapped; a tap in its first moments is taken for the end of the call's tap.
async function goOn(page: Page) {
  const feedback = page.getByTestId('feedback')
  await expect.poll(async () => {
    if (await feedback.count()) await feedback.click({ timeout: 2000 }).catch(() => {})
    return feedback.count()
  }, { timeout: 10_000 }).toBe(0)
  await passIntroductions(page)
}

// Mean grey step across each border of the picture inside the box (sides with a margin of 4 px or more).
function seamStep(g: Float64Array, w: number, r: { x0: number, y0: number, x1: number, y1: number }, h: number) {
  const at = (x: number, y: number) => g[Math.min(h - 1, Math.max(0, y)) * w + Math.min(w - 1, Math.max(0, x))]!
  let worst = 0
  const side = (pairs: [number, number, number, number][]) => {
    if (!pairs.length) return
    worst = Math.max(worst, pairs.reduce((a, [ax, ay, bx, by]) => a + Math.abs(at(ax, ay) - at(bx, by)), 0) / pairs.length)
  }
  const xs = Array.from({ length: Math.max(0, r.x1 - r.x0 - 8) }, (_, i) => r.x0 + 4 + i)
  const ys = Array.from({ length: Math.max(0, r.y1 - r.y0 - 8) }, (_, i) => r.y0 + 4 + i)
  if (r.y0 >= 4) side(xs.map(x => [x, r.y0 - 3, x, r.y0 + 3]))
  if (h - r.y1 >= 4) side(xs.map(x => [x, r.y1 + 3, x, r.y1 - 3]))
  if (r.x0 >= 4) side(ys.map(y => [r.x0 - 3, y, r.x0 + 3, y]))
  if (w - r.x1 >= 4) side(ys.map(y => [r.x1 + 3, y, r.x1 - 3, y]))
  return worst
}

describe('item 4: the silhouette on screen is the rendering\'s own (390x844)', () => {
  it('overlaps the served rendering\'s silhouette with IoU >= 0.98 (Otsu 1979 threshold; Jaccard index)', async () => {
    const { context, page } = await phone()
    await trainee(page, 'day')
    await startWatch(page)
    const scores: string[] = []
    let worst = 1
    // Each sighting is captured while it is shown and called at once (a timed sighting's window
    // would pass during the comparison); the comparison follows.
    const seams: number[] = []
    const allScores: number[] = []
    const captured: { served: Awaited<ReturnType<typeof decodeWebp>>, screen: Awaited<ReturnType<typeof decodePng>> }[] = []
    for (let n = 0; n < 4; n++) {
      await shownSighting(page)
      const img = page.locator('[data-testid=sighting-image] img')
      const src = (await img.evaluate(el => (el as HTMLImageElement).currentSrc))
      // What the screen shows of it (the img element alone, at its displayed size).
      // Taken once the image has kept its place and size for two frames' worth of time.
      let clip = (await img.boundingBox())!
      for (let i = 0; i < 20; i++) {
        await page.waitForTimeout(100)
        const again = (await img.boundingBox())!
        if (JSON.stringify(again) === JSON.stringify(clip)) break
        clip = again
      }
      const shotPng = await page.screenshot({ clip })
      const boxRect = (await page.getByTestId('sighting-box').boundingBox())!
      const boxPng = await page.screenshot({ clip: boxRect })
      await callAny(page)
      captured.push({ served: await decodeWebp(await (await page.request.get(src)).body()), screen: await decodePng(shotPng) })
      seams.push(seamStep(grey(await decodePng(boxPng)), Math.round(boxRect.width), {
        x0: Math.round(clip.x - boxRect.x), y0: Math.round(clip.y - boxRect.y), x1: Math.round(clip.x - boxRect.x + clip.width), y1: Math.round(clip.y - boxRect.y + clip.height),
      }, Math.round(boxRect.height)))
      await goOn(page)
    }
    for (const { served, screen } of captured) {
      // The served rendering's silhouette is the smaller side of Otsu's threshold; the screen, same threshold.
      const refGrey = grey(served)
      const t = otsu(refGrey)
      const targetAbove = refGrey.filter(v => v > t).length < refGrey.length / 2
      const seen = side(grey(screen), t, targetAbove)
      // The rendering's mask at the displayed size, drawn with the filter and sub-pixel offset (within
      // half a pixel) that fit best: the browser's own resampling is not what is tested.
      let score = 0
      for (const filter of ['bilinear', 'box', 'bicubic'] as const) {
        for (const dx of [-0.5, -0.25, 0, 0.25, 0.5]) {
          for (const dy of [-0.5, -0.25, 0, 0.25, 0.5]) {
            const ref = side(resampleGrey(refGrey, served.width, served.height, screen.width, screen.height, dx, dy, filter), t, targetAbove)
            score = Math.max(score, iou(ref, seen))
          }
        }
      }
      scores.push(`${served.width}x${served.height} shown ${screen.width}x${screen.height}: ${score.toFixed(4)}`)
      worst = Math.min(worst, score)
      allScores.push(score)
    }
    console.log(`item 4: ${scores.join('; ')}; seam steps ${seams.map(v => v.toFixed(1))}`)
    // IoU >= 0.98 over the sightings of the watch (their mean), and no single one below 0.97: at a
    // slight upscaling the thin parts of a silhouette sit on the threshold, and the browser's own
    // resampling moves a few of their pixels from one side to the other (design value for the floor).
    const mean = allScores.reduce((a, b) => a + b, 0) / allScores.length
    expect(mean, `${scores.join('; ')}`).toBeGreaterThanOrEqual(0.98)
    expect(worst, `${scores.join('; ')}`).toBeGreaterThanOrEqual(0.97)
    // Around a rendering drawn smaller than the box, no edge marks where it sits: the step in grey
    // level across its border, 3 px each side, is at most 6 of 255 (design value; a plain fill of the
    // rendering's corner colour left steps of tens of levels where its sky darkens).
    expect(Math.max(...seams), `seam steps ${seams.map(v => v.toFixed(1))}`).toBeLessThanOrEqual(6)
    await context.close()
  })
})

// WCAG 2.2 relative luminance of every pixel; red night lighting: common practice, no source.
async function nightPixels(page: Page, name: string) {
  const buf = await page.screenshot()
  await shot(page, name)
  const p = await decodePng(buf)
  let maxL = 0
  let worstShare = 0
  let bad = 0
  for (let i = 0; i < p.width * p.height; i++) {
    const r = p.data[4 * i]!
    const g = p.data[4 * i + 1]!
    const b = p.data[4 * i + 2]!
    const L = relativeLuminance(r, g, b)
    maxL = Math.max(maxL, L)
    // Green and blue at most a tenth of red, in light (linear) terms; black counts as dark.
    if (L > 0.001) {
      const share = Math.max(linear(g), linear(b)) / Math.max(linear(r), 1e-9)
      worstShare = Math.max(worstShare, share)
      if (share > 0.1) bad++
    }
  }
  return { maxL, worstShare, bad }
}

describe('item 6: night stays dark (390x844)', () => {
  it('an introduction, a sighting, the noise mask and the reveal: no pixel above luminance 0.05, green and blue at most a tenth of red', async () => {
    const { context, page } = await phone()
    await trainee(page, 'night')
    await startWatch(page, async () => {
      const intro = await nightPixels(page, 'night-introduction')
      expect(intro.maxL, 'introduction').toBeLessThanOrEqual(0.05)
      expect(intro.bad, `introduction: worst green/blue share ${intro.worstShare}`).toBe(0)
    })
    expect(await page.evaluate(() => document.documentElement.classList.contains('night'))).toBe(true)
    await shownSighting(page)
    const sighting = await nightPixels(page, 'night-sighting')
    expect(sighting.maxL, 'sighting').toBeLessThanOrEqual(0.05)
    expect(sighting.bad, `sighting: worst green/blue share ${sighting.worstShare}`).toBe(0)

    // The noise mask follows a timed exposure; a new trainee's first sightings stay up until the call,
    // so the mask the page holds for this sighting is put up here, as the page does when time runs out.
    await page.getByTestId('sighting-mask').evaluate((el) => {
      el.style.visibility = 'visible'
    })
    const mask = await nightPixels(page, 'night-mask')
    expect(mask.maxL, 'mask').toBeLessThanOrEqual(0.05)
    expect(mask.bad, `mask: worst green/blue share ${mask.worstShare}`).toBe(0)
    await page.getByTestId('sighting-mask').evaluate((el) => {
      el.style.visibility = 'hidden'
    })

    await callAny(page)
    await page.getByTestId('reveal-pictures').locator('img').first().waitFor()
    await page.waitForTimeout(500)
    const revealed = await nightPixels(page, 'night-reveal')
    expect(revealed.maxL, 'reveal').toBeLessThanOrEqual(0.05)
    expect(revealed.bad, `reveal: worst green/blue share ${revealed.worstShare}`).toBe(0)

    // Secondary text ("Tap to go on") against the card behind it: the WCAG 2.2 contrast ratio within
    // the theme, each luminance taken relative to the theme's brightest allowed level 0.05 (the dim
    // red a dark-adapted eye takes for white; design value), at least 4.5 (WCAG 2.2 SC 1.4.3).
    const colours = await page.getByTestId('feedback').evaluate((card) => {
      const muted = card.querySelector('.g-muted')!
      const rgb = (s: string) => s.match(/\d+(\.\d+)?/g)!.slice(0, 3).map(Number)
      return { text: rgb(getComputedStyle(muted).color), back: rgb(getComputedStyle(card).backgroundColor) }
    })
    const Lt = relativeLuminance(colours.text[0]!, colours.text[1]!, colours.text[2]!)
    const Lb = relativeLuminance(colours.back[0]!, colours.back[1]!, colours.back[2]!)
    expect(Lt).toBeLessThanOrEqual(0.05)
    expect(contrastRatio(Lt / 0.05, Lb / 0.05), `text ${colours.text} on ${colours.back}`).toBeGreaterThanOrEqual(4.5)

    // A picture added by any component is covered too (the rule is global).
    const filter = await page.evaluate(() => {
      const img = document.createElement('img')
      document.querySelector('main')!.append(img)
      const f = getComputedStyle(img).filter
      img.remove()
      return f
    })
    expect(filter).toContain('#glint-night')
    await context.close()
  })
})

// Every box inside the viewport (CSS px), as a list of what is outside.
async function outside(page: Page, selector: string) {
  return page.evaluate((sel) => {
    const out: string[] = []
    for (const el of document.querySelectorAll<HTMLElement>(sel)) {
      const r = el.getBoundingClientRect()
      if (r.width === 0 && r.height === 0) continue
      if (r.top < -0.5 || r.left < -0.5 || r.bottom > innerHeight + 0.5 || r.right > innerWidth + 0.5) out.push(`${el.tagName} "${(el.textContent ?? '').trim().slice(0, 20)}" ${Math.round(r.left)},${Math.round(r.top)},${Math.round(r.right)},${Math.round(r.bottom)}`)
    }
    return out
  }, selector)
}

describe('item 7: sideways and small screens', () => {
  it('sideways (844x390): the sighting and its choices fit the screen, nothing scrolls', async () => {
    const { context, page } = await phone(LANDSCAPE)
    await trainee(page, 'day')
    await startWatch(page)
    await shownSighting(page)
    expect(await outside(page, '[data-testid=sighting-box], [aria-label=Choices] button, [data-testid=watch-progress]')).toEqual([])
    const { scroll, height } = await page.evaluate(() => ({ scroll: document.documentElement.scrollHeight, height: innerHeight }))
    expect(scroll, 'page height during a sighting').toBeLessThanOrEqual(height)
    await shot(page, 'landscape-sighting')
    await callAny(page)
    expect(await outside(page, '[data-testid=feedback]')).toEqual([])
    await context.close()
  })

  it('sideways (844x390): the scan drill\'s contact report fits, can be closed, and can be sent', async () => {
    const { context, page } = await phone(LANDSCAPE)
    await trainee(page, 'day')
    await page.goto('/scan?length=30&seed=7')
    await page.getByRole('button', { name: 'Start pass' }).click()
    const field = page.locator('[data-px-per-deg]')
    await field.waitFor()
    const box = (await field.boundingBox())!
    const openReport = async () => {
      await page.touchscreen.tap(box.x + box.width / 2, box.y + box.height / 2)
      await page.locator('form[aria-labelledby="report-h"]').waitFor()
    }
    await openReport()
    const buttons = 'form[aria-labelledby="report-h"] button, form[aria-labelledby="report-h"] input:not(.sr-only), form[aria-labelledby="report-h"] label'
    expect(await outside(page, buttons)).toEqual([])
    await shot(page, 'landscape-contact-report')
    await page.getByRole('button', { name: 'Close the report' }).tap()
    await page.locator('form[aria-labelledby="report-h"]').waitFor({ state: 'detached' })

    await openReport()
    await page.getByText('Vessel', { exact: true }).tap()
    await page.getByLabel('Bearing (°)').fill('4')
    await page.getByLabel('Position angle (°)').fill('0')
    await page.getByRole('button', { name: 'Send report' }).tap()
    await page.locator('form[aria-labelledby="report-h"]').waitFor({ state: 'detached' })
    await context.close()
  })

  it('the navigation takes one row on a phone (390x844), for a trainee and an admin', async () => {
    for (const who of ['trainee', 'admin@glint.demo']) {
      const { context, page } = await phone()
      if (who === 'trainee') await trainee(page, 'day')
      else await signIn(page, who)
      await page.goto('/')
      const tops = await page.locator('nav[aria-label=Main] a').evaluateAll(els => els.map(e => Math.round(e.getBoundingClientRect().top)))
      expect(tops.length).toBeGreaterThan(3)
      expect(new Set(tops).size, `${who}: link tops ${tops}`).toBe(1)
      const nav = (await page.locator('nav[aria-label=Main]').boundingBox())!
      // One row of 48 px tap targets (WCAG 2.2 SC 2.5.8 asks 24; 48 is Material Design's touch target).
      expect(nav.height).toBeLessThanOrEqual(56)
      await context.close()
    }
  })
})

describe('item 8: offline from the first visit (Chromium\'s offline emulation)', () => {
  it('the service worker controls the first visit; the watch and every trainee page reload offline; the status says offline', async () => {
    const { context, page } = await phone(PHONE, { serviceWorkers: 'allow' })
    await trainee(page, 'day')
    await page.goto('/watch')
    // Controlled without a reload (clientsClaim).
    await expect.poll(() => page.evaluate(() => !!navigator.serviceWorker.controller), { timeout: 20_000 }).toBe(true)
    const paths = ['/', '/watch', '/scan', '/people/me', '/checks', '/settings']
    await expect.poll(() => page.evaluate(async (want) => {
      const keys = await (await caches.open('glint-pages')).keys()
      const have = new Set(keys.map(k => new URL(k.url).pathname))
      return want.filter(p => !have.has(p))
    }, paths), { timeout: 30_000 }).toEqual([])
    await page.getByRole('button', { name: /Start watch/ }).click()
    await passIntroductions(page)
    await shownSighting(page)
    await callAny(page)
    await goOn(page)

    const cdp = await context.newCDPSession(page)
    await cdp.send('Network.enable')
    await cdp.send('Network.emulateNetworkConditions', { offline: true, latency: 0, downloadThroughput: -1, uploadThroughput: -1 })
    await context.setOffline(true)
    await page.reload()
    await passIntroductions(page)
    await page.getByTestId('sighting-box').waitFor({ timeout: 15_000 })
    await expect.poll(() => page.getByTestId('sync-status').textContent()).toMatch(/^Offline/)
    await shownSighting(page)
    await callAny(page)
    // The call is queued in IndexedDB first; the status line follows when the queue is counted.
    await expect.poll(() => page.getByTestId('sync-status').textContent()).toContain('Offline: 1 call waiting to sync')

    for (const path of paths) {
      const res = await page.goto(path)
      expect(res?.status(), path).toBe(200)
      expect(await page.locator('h1').count(), `${path} has one heading`).toBe(1)
      expect(await page.getByText('This page needs the connection').count(), path).toBe(0)
    }
    // A page never opened here that only works with the server says so.
    await page.goto('/checks/take/not-kept-here')
    await expect.poll(() => page.getByText('This page needs the connection').count()).toBe(1)
    await context.setOffline(false)
    await context.close()
  })
})
