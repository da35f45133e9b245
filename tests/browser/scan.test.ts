// A trainee's scan pass at phone size: step with pauses, tap a contact, report it, end, find the score stored.
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { PRACTICE_SCAN_SETTINGS } from '../../shared/schemas/scan'
import { placeScanContacts, scanContactPx } from '../../shared/utils/scan-scene'
import type { ScanContact } from '../../shared/utils/scan-scene'
import { DESKTOP, PHONE, launch, newPage, shot, signIn } from '../support/browser'

const settings = { ...PRACTICE_SCAN_SETTINGS, lengthS: 30 }

// A seed whose contact shows early inside the first field (7° wide, centred on 3.5°).
function findSeed(): { seed: number, contact: ScanContact } {
  for (let seed = 1; seed < 20_000; seed++) {
    const c = placeScanContacts(settings, seed).find(x => x.shownAtMs <= 2500 && Math.abs(x.bearing - 3.5) < 2.2)
    if (c) return { seed, contact: c }
  }
  throw new Error('no seed puts a contact in the first field')
}

// Where the contact is on screen, from the field's own scale (the canvas's data attributes).
async function contactPoint(page: Page, contact: ScanContact) {
  const field = page.locator('[data-px-per-deg]')
  const box = (await field.boundingBox())!
  const k = Number(await field.getAttribute('data-px-per-deg'))
  const bearing = Number(await field.getAttribute('data-bearing'))
  const pa = Number(await field.getAttribute('data-position-angle'))
  const cos = Math.cos(((contact.positionAngle + pa) / 2) * Math.PI / 180)
  const x = box.x + box.width / 2 + (contact.bearing - bearing) * cos * k
  const y = box.y + box.height / 2 - (contact.positionAngle - pa) * k
  const px = scanContactPx(contact, 'binoculars')
  return { x, y: contact.category === 'vessel' ? y - px / 2 : y }
}

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('the scan drill at phone size (390x844)', () => {
  it('runs one short pass: steps with pauses, a contact reported, the score shown and stored', async () => {
    const { seed, contact } = findSeed()
    const { context, page } = await newPage(browser, PHONE)
    await signIn(page, 'trainee@glint.demo')
    await page.goto(`/scan?length=30&seed=${seed}`)
    await page.getByRole('heading', { name: 'Scan drill', level: 1 }).waitFor()
    expect(await page.getByText('Practice sector').count()).toBe(1)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await shot(page, 'scan-start')

    await page.getByRole('button', { name: 'Start pass' }).click()
    await page.locator('[data-px-per-deg]').waitFor()
    const startedAt = Date.now()
    // The step buttons are big enough for a thumb (at least 56 px).
    const right = page.getByRole('button', { name: 'Step right' })
    const rb = (await right.boundingBox())!
    expect(Math.min(rb.width, rb.height)).toBeGreaterThanOrEqual(56)

    await page.waitForTimeout(Math.max(0, contact.shownAtMs + 400 - (Date.now() - startedAt)))
    await shot(page, 'scan-field')
    const p = await contactPoint(page, contact)
    await page.mouse.click(p.x, p.y)
    const report = page.getByRole('form', { name: 'Contact report' }).or(page.locator('form[aria-labelledby="report-h"]'))
    await report.first().waitFor()
    await page.getByText(contact.category === 'vessel' ? 'Vessel' : 'Aircraft', { exact: true }).click()
    await page.getByRole('button', { name: /^Field centre \d{3}°$/ }).click()
    await page.getByRole('button', { name: /^Field centre -?\d+\.\d°$/ }).click()
    await page.getByText('Closing', { exact: true }).click()
    await shot(page, 'scan-report')
    await page.getByRole('button', { name: 'Send report' }).click()
    await report.first().waitFor({ state: 'detached' })

    // Three steps right with pauses of more than the 1 s dwell, one by the keyboard.
    for (let i = 0; i < 3; i++) {
      await page.waitForTimeout(1150)
      if (i === 2) await page.keyboard.press('ArrowRight')
      else await right.click()
    }
    await page.waitForTimeout(1150)
    await page.getByRole('button', { name: 'End pass' }).click()
    await page.getByRole('heading', { name: 'Pass scored' }).waitFor()
    expect(await page.getByText('1 / 1').count()).toBe(1)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width)
    await shot(page, 'scan-score')

    const r = await page.request.get('/api/scan/passes')
    expect(r.status()).toBe(200)
    const [latest] = await r.json()
    expect(latest.contactsFound).toBe(1)
    expect(latest.contactsShown).toBe(1)
    // Four patches of 7° held (3.5°, 8.5°, 13.5°, 18.5°): the horizon from 0° to 22° of the 90° sector.
    expect(latest.score.pauseCount).toBeGreaterThanOrEqual(4)
    expect(latest.coverage).toBeCloseTo(22 / 90, 1)
    expect(latest.score.sweeping).toBe(false)
    expect(latest.score.reports[0].matched).toBe(true)
    await context.close()

    // The lead sees the pass beside recognition speed on the crew page (desktop).
    const lead = await newPage(browser, DESKTOP)
    await signIn(lead.page, 'lead@glint.demo')
    const crews = await (await lead.page.request.get('/api/auth/me')).json()
    await lead.page.goto(`/crews/${crews.crews[0].id}`)
    const row = lead.page.getByTestId('crew-scan').getByRole('row', { name: /Nell Farrowby/ })
    await row.waitFor()
    // 22/90 of the sector covered, as the stored pass says (the same coverage as above).
    expect(await row.textContent()).toMatch(/2\d(\.\d)?%/)
    await lead.context.close()
  })

  it('welcomes a landscape phone (844x390) with the field beside the dial', async () => {
    const { seed, contact } = findSeed()
    const { context, page } = await newPage(browser, { width: 844, height: 390 })
    await signIn(page, 'trainee2@glint.demo')
    await page.goto(`/scan?length=30&seed=${seed}`)
    await page.getByRole('button', { name: 'Start pass' }).click()
    await page.locator('[data-px-per-deg]').waitFor()
    await page.waitForTimeout(contact.shownAtMs + 400)
    const field = (await page.locator('[data-px-per-deg]').boundingBox())!
    const dial = (await page.getByRole('img', { name: /^Bearing/ }).boundingBox())!
    expect(dial.x).toBeGreaterThan(field.x + field.width - 1)
    expect(field.y + field.height).toBeLessThanOrEqual(390)
    await shot(page, 'scan-field-landscape')
    await context.close()
  })
})
