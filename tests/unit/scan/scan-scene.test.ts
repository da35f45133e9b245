import { describe, expect, it } from 'vitest'
import { PRACTICE_SCAN_SETTINGS, ScanDrillSettings } from '../../../shared/schemas/scan'
import {
  placeScanContacts,
  scanCloudNoise,
  scanContactPx,
  scanFieldDeg,
  scoreScanPass,
} from '../../../shared/utils/scan-scene'
import type { ScanContact, ScanDrillConfig } from '../../../shared/utils/scan-scene'
import type { ScanSample } from '../../../shared/utils/scan-pattern'

const config: ScanDrillConfig = { ...PRACTICE_SCAN_SETTINGS, lengthS: 120, contactsPerMinute: 4 }

// θ = 2·atan(s / 2d) (plane geometry), in degrees, written out here rather than taken from the code.
const thetaDeg = (s: number, d: number) => 2 * Math.atan(s / (2 * d)) * (180 / Math.PI)
// 1 CSS px ≈ 0.0213° (W3C CSS Values and Units Level 3, "reference pixel").
const REFERENCE_PIXEL_DEG = 0.0213

describe('placeScanContacts', () => {
  it('places the same contacts for the same seed, and others for another seed', () => {
    expect(placeScanContacts(config, 42)).toEqual(placeScanContacts(config, 42))
    const a = placeScanContacts(config, 42).map(c => c.bearing)
    const b = placeScanContacts(config, 43).map(c => c.bearing)
    expect(a).not.toEqual(b)
  })

  it('shows contacts per minute × length of them, sorted by the time they show, inside the drill', () => {
    const contacts = placeScanContacts(config, 7)
    // 4 a minute for 2 minutes.
    expect(contacts).toHaveLength(8)
    expect(contacts.map(c => c.id)).toEqual(['c1', 'c2', 'c3', 'c4', 'c5', 'c6', 'c7', 'c8'])
    for (let i = 1; i < contacts.length; i++) expect(contacts[i]!.shownAtMs).toBeGreaterThanOrEqual(contacts[i - 1]!.shownAtMs)
    for (const c of contacts) {
      expect(c.shownAtMs).toBeGreaterThanOrEqual(0)
      expect(c.goneAtMs).toBeGreaterThan(c.shownAtMs)
      expect(c.goneAtMs).toBeLessThanOrEqual(config.lengthS * 1000)
      expect(config.categories).toContain(c.category)
      expect(config.conditions).toContain(c.condition)
    }
  })

  it('keeps contacts inside the sector, also through north', () => {
    const north = { ...config, startBearing: 330, endBearing: 30 }
    for (let seed = 1; seed <= 20; seed++) {
      for (const c of placeScanContacts(north, seed)) expect(c.bearing >= 330 || c.bearing <= 30).toBe(true)
      for (const c of placeScanContacts(config, seed)) {
        expect(c.bearing).toBeGreaterThanOrEqual(0)
        expect(c.bearing).toBeLessThanOrEqual(90)
      }
    }
  })

  it('puts vessels on the horizon and aircraft low enough for a field held on it (surface mode)', () => {
    const contacts = Array.from({ length: 10 }, (_, s) => placeScanContacts(config, s)).flat()
    for (const c of contacts.filter(x => x.category === 'vessel')) expect(c.positionAngle).toBe(0)
    // A 7° field centred 0.7° below the horizon reaches 2.8° above it.
    for (const c of contacts.filter(x => x.category === 'aircraft')) {
      expect(c.positionAngle).toBeGreaterThan(0)
      expect(c.positionAngle).toBeLessThan(2.8)
    }
  })
})

describe('apparent size of contacts (θ = 2·atan(s/2d), plane geometry; 1 px = 0.0213°, W3C CSS Values 3)', () => {
  it('through 7x binoculars: 7·θ in reference pixels', () => {
    for (const c of placeScanContacts(config, 11)) {
      expect(scanContactPx(c, 'binoculars')).toBeCloseTo(7 * thetaDeg(c.sizeM, c.rangeM) / REFERENCE_PIXEL_DEG, 9)
    }
  })

  it('with the naked eye: θ in reference pixels', () => {
    const naked = { ...config, field: 'naked-eye' as const }
    for (const c of placeScanContacts(naked, 11)) {
      expect(scanContactPx(c, 'naked-eye')).toBeCloseTo(thetaDeg(c.sizeM, c.rangeM) / REFERENCE_PIXEL_DEG, 9)
    }
  })

  it('a 20 m span at 10 km is about 38 px through binoculars (hand value: 2·atan(0.001) = 0.11459°)', () => {
    // 0.11459° × 7 / 0.0213 = 37.66 px.
    expect(scanContactPx({ sizeM: 20, rangeM: 10_000 }, 'binoculars')).toBeCloseTo(0.114592 * 7 / 0.0213, 2)
  })

  it('chooses ranges that keep contacts small but findable (8–26 px binoculars, 4–12 px naked eye)', () => {
    for (let seed = 0; seed < 10; seed++) {
      for (const c of placeScanContacts(config, seed)) {
        const px = 7 * thetaDeg(c.sizeM, c.rangeM) / REFERENCE_PIXEL_DEG
        expect(px).toBeGreaterThan(7.9)
        expect(px).toBeLessThan(26.1)
      }
      for (const c of placeScanContacts({ ...config, field: 'naked-eye' }, seed)) {
        const px = thetaDeg(c.sizeM, c.rangeM) / REFERENCE_PIXEL_DEG
        expect(px).toBeGreaterThan(3.9)
        expect(px).toBeLessThan(12.1)
      }
    }
  })

  it('uses a 7° field for binoculars (common practice, no source)', () => {
    expect(scanFieldDeg('binoculars')).toBe(7)
    expect(scanFieldDeg('naked-eye')).toBeGreaterThan(7)
  })
})

describe('scanCloudNoise', () => {
  it('joins up at north: 0° and 360° give the same cover, and it stays in [0, 1)', () => {
    const noise = scanCloudNoise(9)
    for (const pa of [-2, 0, 5, 12.5, 40]) {
      expect(noise(0, pa)).toBeCloseTo(noise(360, pa), 12)
      expect(Math.abs(noise(359.999, pa) - noise(0, pa))).toBeLessThan(0.01)
    }
    for (let b = 0; b < 360; b += 7) {
      const v = noise(b, b / 10)
      expect(v).toBeGreaterThanOrEqual(0)
      expect(v).toBeLessThan(1)
    }
  })
})

describe('scoreScanPass (common practice, no source)', () => {
  const short: ScanDrillConfig = { ...config, startBearing: 0, endBearing: 30, lengthS: 30 }
  // A lookout holds each centre for 1 s, sampled every 100 ms, at 0.7° below the horizon.
  function track(centres: number[]): ScanSample[] {
    const samples: ScanSample[] = []
    centres.forEach((bearing, k) => {
      for (let d = 0; d < 1000; d += 100) samples.push({ tMs: k * 1000 + d, bearing, positionAngle: -0.7 })
    })
    samples.push({ tMs: centres.length * 1000, bearing: centres[centres.length - 1]! + 1, positionAngle: -0.7 })
    return samples
  }
  const contact: ScanContact = {
    id: 'c1', bearing: 14, positionAngle: 1, shownAtMs: 500, goneAtMs: 20_000,
    category: 'aircraft', rangeM: 9000, sizeM: 20, condition: 'sunlit',
  }

  it('a track of 5° steps with a 7° field covers the sector; one 9° step leaves a 2° gap', () => {
    const steady = scoreScanPass({ config: short, samples: track([3.5, 8.5, 13.5, 18.5, 23.5, 28.5]), contacts: [], reports: [] })
    expect(steady.coverage).toBe(1)
    expect(steady.gaps).toEqual([])
    // 3.5 → 12.5 is a 9° step: fields [0, 7] and [9, 16] leave 7°–9° unseen.
    const gappy = scoreScanPass({ config: short, samples: track([3.5, 12.5, 17.5, 22.5, 27.5]), contacts: [], reports: [] })
    expect(gappy.gaps).toHaveLength(1)
    expect(gappy.gaps[0]!.fromBearing).toBeCloseTo(7, 9)
    expect(gappy.gaps[0]!.toBearing).toBeCloseTo(9, 9)
    expect(gappy.coverage).toBeCloseTo(1 - 2 / 30, 9)
  })

  it('counts a report of a contact in the field, with its times and bearing error', () => {
    // At 2.2 s the field holds 13.5°: the contact at 14° is 0.5° off centre.
    const score = scoreScanPass({
      config: short,
      samples: track([3.5, 8.5, 13.5, 18.5]),
      contacts: [contact],
      reports: [{ contactId: 'c1', tapAtMs: 2200, reportedAtMs: 5200, category: 'aircraft', bearing: 17, positionAngle: 2, closing: 'closing' }],
    })
    expect(score.contactsShown).toBe(1)
    expect(score.contactsFound).toBe(1)
    expect(score.medianDetectMs).toBe(2200 - 500)
    expect(score.medianReportMs).toBe(3000)
    expect(score.medianBearingErrorDeg).toBe(3)
    expect(score.reports[0]!.categoryRight).toBe(true)
    expect(score.falseReports).toBe(0)
  })

  it('does not count a tap when the contact was not in the field, nor a second report of it', () => {
    const score = scoreScanPass({
      config: short,
      samples: track([3.5, 8.5, 13.5, 18.5]),
      contacts: [contact],
      reports: [
        // At 0.6 s the field holds 3.5°: 10.5° away from the contact.
        { contactId: 'c1', tapAtMs: 600, reportedAtMs: 900, category: 'vessel', bearing: 14, positionAngle: 0, closing: 'unknown' },
        { contactId: 'c1', tapAtMs: 2100, reportedAtMs: 2500, category: 'aircraft', bearing: 14, positionAngle: 1, closing: 'opening' },
        { contactId: 'c1', tapAtMs: 2600, reportedAtMs: 2900, category: 'aircraft', bearing: 14, positionAngle: 1, closing: 'opening' },
      ],
    })
    expect(score.contactsFound).toBe(1)
    expect(score.reports.map(r => r.matched)).toEqual([false, true, false])
    expect(score.falseReports).toBe(2)
    expect(score.medianDetectMs).toBe(2100 - 500)
  })

  it('does not count contacts that had not shown yet when the pass ended', () => {
    const late = { ...contact, id: 'c2', shownAtMs: 25_000, goneAtMs: 29_000 }
    const score = scoreScanPass({ config: short, samples: track([3.5, 8.5]), contacts: [contact, late], reports: [] })
    expect(score.contactsShown).toBe(1)
    expect(score.contactsFound).toBe(0)
    expect(score.medianDetectMs).toBeNull()
  })
})

describe('ScanDrillSettings (the instructor form and the API)', () => {
  it('takes the practice defaults and refuses values out of range with a sentence', () => {
    expect(ScanDrillSettings.safeParse(PRACTICE_SCAN_SETTINGS).success).toBe(true)
    const bad = (patch: Record<string, unknown>) => ScanDrillSettings.safeParse({ ...PRACTICE_SCAN_SETTINGS, ...patch })
    expect(bad({ stepDeg: 0 }).error?.issues[0]?.message).toMatch(/1 to 20/)
    expect(bad({ stepDeg: 21 }).success).toBe(false)
    expect(bad({ dwellMs: 200 }).error?.issues[0]?.message).toMatch(/0.3 to 3 s/)
    expect(bad({ lengthS: 20 }).success).toBe(false)
    expect(bad({ lengthS: 601 }).success).toBe(false)
    expect(bad({ contactsPerMinute: 11 }).success).toBe(false)
    expect(bad({ conditions: [] }).success).toBe(false)
    expect(bad({ conditions: ['sunlit', 'sunlit'] }).success).toBe(false)
    expect(bad({ conditions: ['moonlit'] }).success).toBe(false)
    expect(bad({ categories: ['submarine'] }).success).toBe(false)
    expect(bad({ startBearing: 360 }).success).toBe(false)
    expect(bad({ field: 'telescope' }).success).toBe(false)
  })
})
