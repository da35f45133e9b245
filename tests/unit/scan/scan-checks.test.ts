// What a scan pass must keep to before it is scored (issue 14, item 4), and the pause rule of a found contact.
import { describe, expect, it } from 'vitest'
import { PRACTICE_SCAN_SETTINGS } from '../../../shared/schemas/scan'
import { maxScanSamples, scanPassProblem, scanPositionAngleLimits, scanSectorOffset } from '../../../shared/utils/scan-checks'
import { scoreScanPass } from '../../../shared/utils/scan-scene'
import type { ScanContact, ScanDrillConfig, ScanReport } from '../../../shared/utils/scan-scene'
import type { ScanSample } from '../../../shared/utils/scan-pattern'

const config: ScanDrillConfig = { ...PRACTICE_SCAN_SETTINGS, startBearing: 0, endBearing: 30, lengthS: 30 }
const hold = (tMs: number, bearing = 3.5, positionAngle = -0.7): ScanSample => ({ tMs, bearing, positionAngle })
const contact: ScanContact = {
  id: 'c1', bearing: 14, positionAngle: 0, shownAtMs: 500, goneAtMs: 20_000,
  category: 'vessel', rangeM: 12_000, sizeM: 20, condition: 'sunlit',
}
const report = (tapAtMs: number, contactId: string | null = 'c1'): ScanReport =>
  ({ contactId, tapAtMs, reportedAtMs: tapAtMs + 300, category: 'vessel', bearing: 14, positionAngle: 0, closing: 'unknown' })
const problem = (samples: ScanSample[], reports: ScanReport[] = []) => scanPassProblem({ config, contacts: [contact], samples, reports })

describe('scanPassProblem (design values, named beside each)', () => {
  it('takes a lookout\'s track: 1 s holds and 5° steps over 150 ms (common practice, no source)', () => {
    const samples: ScanSample[] = []
    for (let k = 0; k < 6; k++) {
      samples.push(hold(k * 1150, 3.5 + 5 * k), hold(k * 1150 + 500, 3.5 + 5 * k), hold(k * 1150 + 1000, 3.5 + 5 * k))
    }
    expect(problem(samples, [report(2500)])).toBeNull()
  })

  it('bounds the samples at 25 a second of the pass (design value: the phone samples at most every 40 ms)', () => {
    expect(maxScanSamples(30)).toBe(30 * 25 + 25)
    const many = Array.from({ length: 776 }, (_, k) => hold(k))
    expect(problem(many)).toMatch(/at most 775 samples; this one has 776/)
    expect(problem(many.slice(0, 775))).toBeNull()
  })

  it('refuses times that go backwards or past the pass', () => {
    expect(problem([hold(0), hold(10), hold(5)])).toMatch(/times go backwards at sample 3/)
    expect(problem([hold(0), hold(31_001)])).toMatch(/past the pass's length of 30 s/)
    expect(problem([hold(0), hold(31_000)])).toBeNull()
  })

  it('refuses a field wholly outside the sector, and one above what the page allows', () => {
    // Half a 7° field past either edge still shows the sector; more does not.
    expect(problem([hold(0, 356.5), hold(1000, 33.5)])).toBeNull()
    expect(problem([hold(0), hold(1000, 35)])).toMatch(/outside the drill's sector 000°–030°/)
    expect(problem([hold(0), hold(1000, 355)])).toMatch(/outside/)
    expect(scanPositionAngleLimits(config)).toEqual({ bottom: -3.5, top: 10 })
    expect(problem([hold(0, 3.5, 10.4)])).toBeNull()
    expect(problem([hold(0), hold(10, 3.5, -4.1)])).toMatch(/position angle/)
  })

  it('reads a bearing before the sector start as negative, through north', () => {
    const north = { startBearing: 330, endBearing: 30 }
    expect(scanSectorOffset(north, 320)).toBeCloseTo(-10, 9)
    expect(scanSectorOffset(north, 10)).toBeCloseTo(40, 9)
    expect(scanSectorOffset(north, 200)).toBeCloseTo(-130, 9)
    expect(scanSectorOffset({ startBearing: 0, endBearing: 0 }, 350)).toBeCloseTo(350, 9)
  })

  it('refuses turns over 360° a second across any 250 ms (design value), allows 90° in 250 ms', () => {
    // 20° every 62.5 ms is 320° a second: 80° in a window.
    const fast = Array.from({ length: 9 }, (_, k) => hold(k * 62.5, k % 2 ? 23.5 : 3.5))
    expect(problem(fast)).toBeNull()
    // 20° every 50 ms is 400° a second: 100° in a window.
    const faster = Array.from({ length: 9 }, (_, k) => hold(k * 50, k % 2 ? 23.5 : 3.5))
    expect(problem(faster)).toMatch(/turns 100° within 250 ms/)
    // Two samples 1 s apart: up to 360° between them, a field can be anywhere in the sector.
    expect(problem([hold(0, 1), hold(1000, 29)])).toBeNull()
    // Position angle counts too: 10° up and down every 25 ms.
    expect(problem(Array.from({ length: 12 }, (_, k) => hold(k * 25, 3.5, k % 2 ? 9 : -1)))).toMatch(/turns/)
  })

  it('refuses reports of contacts not in the scene, after the samples, or while one was still open', () => {
    const samples = [hold(0), hold(3000)]
    expect(problem(samples, [report(500, 'c2')])).toMatch(/c2 is not a contact of this pass's scene/)
    expect(problem(samples, [report(500, null)])).toBeNull()
    expect(problem(samples, [report(3100)])).toMatch(/after the last sample/)
    expect(problem(samples, [report(500), report(700, null)])).toMatch(/report 2 was tapped at 0.7 s, before report 1 was sent \(0.8 s\)/)
    expect(problem(samples, [report(500), report(800, null)])).toBeNull()
  })
})

describe('scoreScanPass: a contact counts only inside a pause whose field held it', () => {
  it('does not count a tap while the field moves, nor one under 100 ms after the contact showed (Whelan 2008)', () => {
    // The field sweeps from 0° to 30° in 3 s, never stopping: it passes the contact, but no pause holds it.
    const sweep = Array.from({ length: 31 }, (_, k) => hold(k * 100, k))
    const moving = scoreScanPass({ config, samples: sweep, contacts: [contact], reports: [report(1400)] })
    expect(moving.contactsFound).toBe(0)
    // Held on 13.5° from 0 to 2 s: a tap 50 ms after the contact shows is an anticipation, 150 ms is not.
    const held = [hold(0, 13.5), hold(1000, 13.5), hold(2000, 13.5)]
    expect(scoreScanPass({ config, samples: held, contacts: [contact], reports: [report(550)] }).contactsFound).toBe(0)
    const found = scoreScanPass({ config, samples: held, contacts: [contact], reports: [report(650)] })
    expect(found.contactsFound).toBe(1)
    expect(found.medianDetectMs).toBe(150)
  })
})
