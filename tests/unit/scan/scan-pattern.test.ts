import { describe, expect, it } from 'vitest'
import { apparentAngleDeg } from '../../../shared/utils/apparent-size'
import {
  contactApparentPx,
  isInField,
  normalizeBearing,
  planScan,
  scorePass,
  sectorWidth,
} from '../../../shared/utils/scan-pattern'
import type { ScanSample, ScanSettings } from '../../../shared/utils/scan-pattern'

// Trade values (check-values.md): 7x50 binoculars have about a 7° field, the step is 5°, the
// dwell about 1 s, binoculars reach up to a 25–30° position angle in the sky, the naked eye goes
// to the zenith on every third column. All "common practice, no source".
const FIELD = 7
const STEP = 5
const DWELL = 1000

function surface(startBearing: number, endBearing: number, extra: Partial<ScanSettings> = {}): ScanSettings {
  return { startBearing, endBearing, fieldDeg: FIELD, stepDeg: STEP, dwellMs: DWELL, sweepBackMs: 1500, mode: 'surface', ...extra }
}

/**
 * A lookout at work: holds each listed centre for dwellMs (sampled every 100 ms), jumps to the
 * next, then sweeps back to the first at 60°/s, sampled every 50 ms.
 */
function recordPass(centres: number[], positionAngle: number, dwellMs: number, sweepBack: boolean): ScanSample[] {
  const samples: ScanSample[] = []
  let t = 0
  for (const bearing of centres) {
    for (let d = 0; d < dwellMs; d += 100) samples.push({ tMs: t + d, bearing, positionAngle })
    t += dwellMs
  }
  const last = centres[centres.length - 1]!
  if (sweepBack) {
    const back = last - centres[0]!
    const steps = Math.round(back / 3)
    for (let k = 1; k <= steps; k++) samples.push({ tMs: t + (k - 1) * 50, bearing: normalizeBearing(last - (back * k) / steps), positionAngle })
  }
  else {
    samples.push({ tMs: t, bearing: last + 0.1, positionAngle })
  }
  return samples
}

describe('planScan: surface search (common practice, no source)', () => {
  it('a 7° field stepped by 5° overlaps by 2°', () => {
    expect(planScan(surface(0, 90)).overlapDeg).toBe(7 - 5)
  })

  it('a 90° sector needs 18 pauses', () => {
    // Hand count: first field's left edge on the sector start (centre 3.5°); field k's right edge
    // sits at 7 + 5k. The last field must reach 90°: 7 + 5k >= 90 → k >= 16.6 → k = 17,
    // so fields k = 0..17: 18 pauses. With 17 pauses the right edge stops at 7 + 5·16 = 87° < 90°.
    const plan = planScan(surface(0, 90))
    expect(plan.pauseCount).toBe(18)
    expect(plan.pauses).toHaveLength(18)
    expect(plan.pauses[0]!.bearing).toBe(3.5)
    expect(plan.pauses[17]!.bearing).toBe(3.5 + 17 * 5)
    expect(plan.pauses.every(p => p.row === 0 && p.field === 'binoculars')).toBe(true)
  })

  it('at a 1 s dwell one pass takes 18 s plus the sweep back (and the moves when modelled)', () => {
    // 18 pauses × 1000 ms + 1500 ms sweep back = 19 500 ms.
    expect(planScan(surface(0, 90)).passMs).toBe(18 * 1000 + 1500)
    // With 200 ms to move between pauses: 17 moves between 18 pauses → 19 500 + 3 400 = 22 900 ms.
    expect(planScan(surface(0, 90, { moveMs: 200 })).passMs).toBe(18 * 1000 + 17 * 200 + 1500)
  })

  it('puts the horizon just above the field centre', () => {
    const plan = planScan(surface(0, 90))
    for (const p of plan.pauses) {
      expect(p.positionAngle).toBeLessThan(0)
      expect(p.positionAngle).toBeGreaterThan(-FIELD / 4)
    }
  })

  it('a proper plan covers the whole horizon band of the sector', () => {
    const plan = planScan(surface(0, 90))
    expect(plan.coverage).toBe(1)
    expect(plan.gaps).toEqual([])
  })

  it('a sector through north (315° to 045°) is 90° wide and plans the same 18 pauses', () => {
    expect(sectorWidth(315, 45)).toBe(90)
    const plan = planScan(surface(315, 45))
    expect(plan.pauseCount).toBe(18)
    expect(plan.pauses[0]!.bearing).toBe(318.5)
    // Column 8 sits at 315 + 3.5 + 40 = 358.5°, column 9 at 3.5° past north.
    expect(plan.pauses[8]!.bearing).toBeCloseTo(358.5, 9)
    expect(plan.pauses[9]!.bearing).toBeCloseTo(3.5, 9)
    expect(plan.coverage).toBe(1)
  })

  it('a step wider than the field leaves gaps of step − field between patches', () => {
    // 9° steps with a 7° field: fields [0,7], [9,16], ... leave 2° unseen between neighbours.
    const plan = planScan(surface(0, 30, { stepDeg: 9 }))
    expect(plan.overlapDeg).toBe(-2)
    expect(plan.gaps.length).toBeGreaterThan(0)
    expect(plan.gaps[0]!.fromBearing).toBeCloseTo(7, 9)
    expect(plan.gaps[0]!.widthDeg).toBeCloseTo(2, 9)
    expect(plan.coverage).toBeLessThan(1)
  })

  it('rejects a step or field of zero', () => {
    expect(() => planScan(surface(0, 90, { stepDeg: 0 }))).toThrow(RangeError)
    expect(() => planScan(surface(0, 90, { fieldDeg: 0 }))).toThrow(RangeError)
  })
})

describe('planScan: sky search (common practice, no source)', () => {
  for (const ceilingDeg of [25, 30]) {
    it(`binocular rows never reach above a ${ceilingDeg}° ceiling`, () => {
      const plan = planScan(surface(0, 90, { mode: 'sky', ceilingDeg }))
      const binocular = plan.pauses.filter(p => p.field === 'binoculars')
      for (const p of binocular) expect(p.positionAngle + FIELD / 2).toBeLessThanOrEqual(ceilingDeg)
      // One more step up would pass the ceiling: the highest row is as high as allowed.
      const highest = Math.max(...binocular.map(p => p.positionAngle))
      expect(highest + STEP + FIELD / 2).toBeGreaterThan(ceilingDeg)
    })
  }

  it('steps binocular rows up by the step, 5 rows per column under a 25° ceiling', () => {
    // Row r's centre is at −0.7 + 5r (field 7, horizon 0.7° above the centre), its top at 2.8 + 5r:
    // 2.8 + 5r <= 25 → r <= 4.44 → rows 0..4.
    const plan = planScan(surface(0, 90, { mode: 'sky', ceilingDeg: 25 }))
    const column0 = plan.pauses.filter(p => p.column === 0 && p.field === 'binoculars').map(p => p.positionAngle)
    expect(column0).toHaveLength(5)
    for (let r = 1; r < column0.length; r++) expect(column0[r]! - column0[r - 1]!).toBeCloseTo(STEP, 9)
  })

  it('goes up to the zenith with the naked eye only on every third column (every 15°)', () => {
    const plan = planScan(surface(0, 90, { mode: 'sky', ceilingDeg: 25, zenithEvery: 3 }))
    const naked = plan.pauses.filter(p => p.field === 'naked-eye')
    const columns = [...new Set(naked.map(p => p.column))].sort((a, b) => a - b)
    // 18 columns (0..17): every third is 0, 3, 6, 9, 12, 15.
    expect(columns).toEqual([0, 3, 6, 9, 12, 15])
    const bearings = [...new Set(naked.map(p => p.bearing))].sort((a, b) => a - b)
    for (let k = 1; k < bearings.length; k++) expect(bearings[k]! - bearings[k - 1]!).toBeCloseTo(15, 9)
    for (const c of columns) {
      const col = naked.filter(p => p.column === c)
      expect(Math.max(...col.map(p => p.positionAngle))).toBe(90)
      for (const p of col) expect(p.positionAngle).toBeGreaterThan(25)
    }
    expect(Math.max(...plan.pauses.map(p => p.positionAngle))).toBeLessThanOrEqual(90)
  })

  it('counts every pause in the pass time', () => {
    const settings = surface(0, 90, { mode: 'sky', ceilingDeg: 25 })
    const plan = planScan(settings)
    expect(plan.pauseCount).toBe(plan.pauses.length)
    expect(plan.passMs).toBe(plan.pauses.length * DWELL + settings.sweepBackMs)
    // More than the surface row alone: 18 columns × 5 binocular rows plus the naked-eye pauses.
    expect(plan.pauseCount).toBeGreaterThan(18 * 5)
  })
})

describe('scorePass (common practice, no source)', () => {
  const settings = surface(0, 90)
  const planned = planScan(settings).pauses.map(p => p.bearing)

  it('a proper pass: every pause held 1 s, full coverage, no sweeping, a measured sweep back', () => {
    const samples = recordPass(planned, -0.7, DWELL, true)
    const score = scorePass({ settings, samples })
    expect(score.pauseCount).toBe(18)
    expect(score.dwellPerPause).toBe(1000)
    expect(score.coverage).toBe(1)
    expect(score.gaps).toEqual([])
    expect(score.sweeping).toBe(false)
    expect(score.sweepDeg).toBeCloseTo(STEP, 9)
    // 85° back at 3° per 50 ms sample: the last sample arrives (steps − 1) × 50 ms after leaving.
    const steps = Math.round((planned[17]! - planned[0]!) / 3)
    expect(score.sweepBackMs).toBe((steps - 1) * 50)
  })

  it('one step of 9° with a 7° field leaves a 2° gap', () => {
    // Pauses at 3.5 and 12.5 (a 9° step), then 5° steps to the end: fields [0,7] and [9,16] leave 7°..9°.
    const centres = [3.5, 12.5]
    for (let b = 17.5; b <= 87.5; b += 5) centres.push(b)
    const score = scorePass({ settings, samples: recordPass(centres, -0.7, DWELL, true) })
    expect(score.gaps).toHaveLength(1)
    expect(score.gaps[0]!.fromBearing).toBeCloseTo(7, 9)
    expect(score.gaps[0]!.toBearing).toBeCloseTo(9, 9)
    expect(score.gaps[0]!.widthDeg).toBeCloseTo(9 - 7, 9)
    expect(score.coverage).toBeCloseTo(1 - 2 / 90, 9)
    expect(score.sweeping).toBe(false)
  })

  it('a steady sweep with no pause is sweeping and covers nothing', () => {
    // 10°/s across the sector, sampled every 50 ms: the field never holds for a second.
    const samples: ScanSample[] = []
    for (let t = 0; t <= 9000; t += 50) samples.push({ tMs: t, bearing: t / 100, positionAngle: -0.7 })
    const score = scorePass({ settings, samples })
    expect(score.pauseCount).toBe(0)
    expect(score.sweeping).toBe(true)
    expect(score.sweepDeg).toBeCloseTo(90, 9)
    expect(score.coverage).toBe(0)
    expect(score.gaps).toEqual([{ fromBearing: 0, toBearing: 90, widthDeg: 90 }])
  })

  it('pauses shorter than the dwell do not count as seen', () => {
    const score = scorePass({ settings, samples: recordPass(planned, -0.7, 400, false) })
    expect(score.pauseCount).toBe(0)
    expect(score.coverage).toBe(0)
  })
})

describe('contacts', () => {
  it('apparent size follows θ = 2·atan(s / 2d) (plane geometry), 7x through binoculars', () => {
    // A 20 m target at 5 km: θ = 2·atan(20 / 10 000) in degrees; 1 CSS px ≈ 0.0213° (W3C CSS Values 3).
    const theta = 2 * Math.atan(20 / (2 * 5000)) * 180 / Math.PI
    expect(apparentAngleDeg(20, 5000)).toBeCloseTo(theta, 12)
    expect(contactApparentPx(20, 5000, 'binoculars')).toBeCloseTo(theta * 7 / 0.0213, 9)
    expect(contactApparentPx(20, 5000, 'naked-eye')).toBeCloseTo(theta / 0.0213, 9)
  })

  it('a contact is in a 7° field within 3.5° of its centre', () => {
    const centre = { bearing: 10, positionAngle: 0, fieldDeg: 7 }
    expect(isInField(centre, { bearing: 13.4, positionAngle: 0 })).toBe(true)
    expect(isInField(centre, { bearing: 13.6, positionAngle: 0 })).toBe(false)
    expect(isInField({ ...centre, bearing: 359 }, { bearing: 1, positionAngle: 0 })).toBe(true)
  })
})
