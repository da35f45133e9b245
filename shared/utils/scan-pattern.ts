// The lookout's scan pattern: where to pause along a sector, how long a pass takes, how much of
// the horizon it covers, and how a recorded pass measures up. Pure: the phone draws the drill
// from it and the server scores the stored pass with the same code.
//
// Trade practice (common practice, no published source): pause about 1 s on a patch, move on by
// less than the field of view so patches overlap (7° field of 7x50 binoculars, 5° step), sweep
// back fast to the start; in the sky, binoculars up to a position angle of about 25 to 30°, the
// naked eye above, up to the zenith only on every third column (about every 15° of bearing).
//
// Geometry: bearings in degrees clockwise from north, position angle in degrees above the
// horizon (0 horizon, 90 zenith). A field is measured by its width along the bearing: the
// curvature of a circular field's edge at the horizon is not modelled, so a 7° field whose centre
// sits at 8° covers the horizon from 4.5° to 11.5°.
//
// Pause placement (planScan):
// - the sector runs clockwise from startBearing to endBearing; equal bearings mean the full circle;
// - columns: the first column is centred at start + field/2 (the field's left edge on the sector
//   start), then one every step, until the field's right edge reaches or passes the end, so
//   columns = max(1, ceil((width - field) / step) + 1); a sector narrower than the field gets one
//   column centred on it;
// - surface mode: one row, the field's centre horizonOffsetDeg below the horizon (the horizon just
//   above the centre);
// - sky mode: row 0 as in surface mode, then rows every step upwards while the field's top edge
//   (centre + field/2) stays at or below the ceiling; above the highest binocular row's top edge,
//   naked-eye pauses every (nakedEyeField - overlap) up to the zenith (the last one clamped to a
//   position angle of 90°), only on columns 0, zenithEvery, 2·zenithEvery, ...; with naked-eye
//   optics there is no ceiling: every column's rows go up to the zenith;
// - order: column by column, even columns upwards, odd columns downwards.

import { apparentPx, BINOCULAR_MAGNIFICATION } from './apparent-size'

export type ScanMode = 'surface' | 'sky'
export type FieldKind = 'binoculars' | 'naked-eye'

export interface ScanSettings {
  startBearing: number
  endBearing: number
  // true field of the optics in degrees (about 7 for 7x50 binoculars)
  fieldDeg: number
  stepDeg: number
  dwellMs: number
  // time of the fast sweep back to the start at the end of a pass
  sweepBackMs: number
  mode: ScanMode
  // optics of the main field; default 'binoculars'
  optics?: FieldKind
  // sky mode: highest position angle a binocular field may reach; default 25
  ceilingDeg?: number
  // sky mode: naked-eye pauses up to the zenith on every n-th column; default 3
  zenithEvery?: number
  // sky mode: field of a naked-eye pause above the ceiling; default 30
  nakedEyeFieldDeg?: number
  // how far below the horizon the field's centre sits; default fieldDeg / 10
  horizonOffsetDeg?: number
  // time to move from one pause to the next; default 0 (not modelled)
  moveMs?: number
}

export interface PlannedPause {
  bearing: number
  positionAngle: number
  field: FieldKind
  fieldDeg: number
  column: number
  row: number
}

export interface Gap {
  fromBearing: number
  toBearing: number
  widthDeg: number
}

export interface ScanPlan {
  sectorDeg: number
  pauses: PlannedPause[]
  columnCount: number
  overlapDeg: number
  pauseCount: number
  passMs: number
  coverage: number
  gaps: Gap[]
}

// Design values, no source: the height of the sky sweep and how often the zenith is searched.
export const DEFAULT_CEILING_DEG = 25
export const DEFAULT_ZENITH_EVERY = 3
// The sector a lookout searches with the naked eye at a time: design value, no source (common
// practice speaks of sweeping in overlapping sectors; 30° is our choice, set per scan drill).
export const DEFAULT_NAKED_EYE_FIELD_DEG = 30
export const ZENITH_DEG = 90

// Room for rounding in sums of degrees (steps of 0.1° add up unevenly in binary).
const EPS = 1e-9

export function normalizeBearing(bearing: number): number {
  const b = bearing % 360
  const n = b < 0 ? b + 360 : b
  // 359.9999999999 and -0 both read as 0 on a dial.
  return n >= 360 - EPS || Math.abs(n) < EPS ? 0 : n
}

/** Width of the sector clockwise from start to end, in (0, 360]; equal bearings give 360. */
export function sectorWidth(startBearing: number, endBearing: number): number {
  const w = normalizeBearing(endBearing - startBearing)
  return w === 0 ? 360 : w
}

/** Signed shortest turn from one bearing to another, in [-180, 180). */
export function bearingDelta(from: number, to: number): number {
  const d = normalizeBearing(to - from)
  return d >= 180 ? d - 360 : d
}

function assertPositive(name: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a positive number, got ${value}`)
}

function assertNonNegative(name: string, value: number): void {
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be zero or more, got ${value}`)
}

function checkSettings(s: ScanSettings): void {
  if (!Number.isFinite(s.startBearing) || !Number.isFinite(s.endBearing)) throw new RangeError('bearings must be numbers')
  assertPositive('fieldDeg', s.fieldDeg)
  assertPositive('stepDeg', s.stepDeg)
  assertNonNegative('dwellMs', s.dwellMs)
  assertNonNegative('sweepBackMs', s.sweepBackMs)
  if (s.moveMs !== undefined) assertNonNegative('moveMs', s.moveMs)
  if (s.ceilingDeg !== undefined) assertPositive('ceilingDeg', s.ceilingDeg)
  if (s.nakedEyeFieldDeg !== undefined) assertPositive('nakedEyeFieldDeg', s.nakedEyeFieldDeg)
  if (s.zenithEvery !== undefined && (!Number.isInteger(s.zenithEvery) || s.zenithEvery < 1)) {
    throw new RangeError(`zenithEvery must be a whole number >= 1, got ${s.zenithEvery}`)
  }
  if (s.mode !== 'surface' && s.mode !== 'sky') throw new RangeError(`unknown scan mode: ${String(s.mode)}`)
}

/** Bearings (sector-relative offsets) of the column centres, by the placement rule above. */
function columnOffsets(width: number, field: number, step: number): number[] {
  if (width <= field + EPS) return [width / 2]
  const count = Math.ceil((width - field) / step - EPS) + 1
  return Array.from({ length: count }, (_, k) => field / 2 + k * step)
}

/** Position angles of one column's rows, bottom up, with the optics of each. */
function columnRows(s: ScanSettings, column: number): { positionAngle: number, field: FieldKind, fieldDeg: number }[] {
  const optics = s.optics ?? 'binoculars'
  const half = s.fieldDeg / 2
  const base = -(s.horizonOffsetDeg ?? s.fieldDeg / 10)
  if (s.mode === 'surface') return [{ positionAngle: base, field: optics, fieldDeg: s.fieldDeg }]

  const rows: { positionAngle: number, field: FieldKind, fieldDeg: number }[] = []
  if (optics === 'naked-eye') {
    for (let pa = base; ; pa += s.stepDeg) {
      rows.push({ positionAngle: Math.min(pa, ZENITH_DEG), field: optics, fieldDeg: s.fieldDeg })
      if (pa + half >= ZENITH_DEG - EPS) break
    }
    return rows
  }

  const ceiling = s.ceilingDeg ?? DEFAULT_CEILING_DEG
  let pa = base
  rows.push({ positionAngle: pa, field: 'binoculars', fieldDeg: s.fieldDeg })
  while (pa + s.stepDeg + half <= ceiling + EPS) {
    pa += s.stepDeg
    rows.push({ positionAngle: pa, field: 'binoculars', fieldDeg: s.fieldDeg })
  }

  const every = s.zenithEvery ?? DEFAULT_ZENITH_EVERY
  if (column % every !== 0) return rows
  const nField = s.nakedEyeFieldDeg ?? DEFAULT_NAKED_EYE_FIELD_DEG
  // Naked-eye patches overlap by as much as the binocular ones, but never step by less than half a field.
  const nStep = Math.max(nField - (s.fieldDeg - s.stepDeg), nField / 2)
  const top = pa + half
  if (top >= ZENITH_DEG - EPS) return rows
  for (let c = top + nField / 2; ; c += nStep) {
    rows.push({ positionAngle: Math.min(c, ZENITH_DEG), field: 'naked-eye', fieldDeg: nField })
    if (c + nField / 2 >= ZENITH_DEG - EPS) break
  }
  return rows
}

export interface HorizonField {
  bearing: number
  positionAngle: number
  fieldDeg: number
}

/**
 * Share of the sector's horizon band inside at least one field, and the parts left out.
 * Only fields that contain the horizon (|position angle| <= field/2) count.
 */
export function horizonCoverage(
  startBearing: number,
  endBearing: number,
  fields: readonly HorizonField[],
): { coverage: number, gaps: Gap[] } {
  const width = sectorWidth(startBearing, endBearing)
  const pieces: [number, number][] = []
  for (const f of fields) {
    const half = f.fieldDeg / 2
    if (Math.abs(f.positionAngle) > half + EPS) continue
    const rel = normalizeBearing(f.bearing - startBearing)
    // The same field seen one turn either way, so fields straddling the start or the 0/360 seam count.
    for (const shift of [-360, 0, 360]) {
      const a = Math.max(0, rel + shift - half)
      const b = Math.min(width, rel + shift + half)
      if (b > a) pieces.push([a, b])
    }
  }
  pieces.sort((p, q) => p[0] - q[0])

  const gaps: Gap[] = []
  let covered = 0
  let reach = 0
  const addGap = (from: number, to: number): void => {
    if (to - from > EPS) {
      gaps.push({ fromBearing: normalizeBearing(startBearing + from), toBearing: normalizeBearing(startBearing + to), widthDeg: to - from })
    }
  }
  for (const [a, b] of pieces) {
    if (a > reach + EPS) addGap(reach, a)
    if (b > reach) {
      covered += b - Math.max(a, reach)
      reach = b
    }
  }
  addGap(reach, width)
  const coverage = Math.min(1, covered / width)
  return { coverage: coverage > 1 - EPS ? 1 : coverage, gaps }
}

/** The plan of one pass over a sector: its pauses, overlap, time and horizon coverage. */
export function planScan(settings: ScanSettings): ScanPlan {
  checkSettings(settings)
  const width = sectorWidth(settings.startBearing, settings.endBearing)
  const offsets = columnOffsets(width, settings.fieldDeg, settings.stepDeg)

  const pauses: PlannedPause[] = []
  offsets.forEach((offset, column) => {
    const bearing = normalizeBearing(settings.startBearing + offset)
    const rows = columnRows(settings, column).map((r, row) => ({ ...r, row }))
    if (column % 2 === 1) rows.reverse()
    for (const r of rows) pauses.push({ bearing, positionAngle: r.positionAngle, field: r.field, fieldDeg: r.fieldDeg, column, row: r.row })
  })

  const pauseCount = pauses.length
  const moveMs = settings.moveMs ?? 0
  const passMs = pauseCount * settings.dwellMs + Math.max(0, pauseCount - 1) * moveMs + settings.sweepBackMs
  const { coverage, gaps } = horizonCoverage(settings.startBearing, settings.endBearing, pauses)
  return {
    sectorDeg: width,
    pauses,
    columnCount: offsets.length,
    overlapDeg: settings.fieldDeg - settings.stepDeg,
    pauseCount,
    passMs,
    coverage,
    gaps,
  }
}

// ---------------------------------------------------------------- scoring a recorded pass

export interface ScanSample {
  tMs: number
  // where the field's centre points
  bearing: number
  positionAngle: number
  // the field at this moment, when the drill lets the trainee change optics; default settings.fieldDeg
  fieldDeg?: number
}

export interface ScorePassInput {
  settings: ScanSettings
  // the field's centre over time; the field holds each sample's position until the next sample
  samples: readonly ScanSample[]
  // shortest stop that counts as a pause; default settings.dwellMs
  minDwellMs?: number
  // how far the field may wander and still be one stop; default 0.5°
  toleranceDeg?: number
  // movement along the bearing with no pause beyond which the pass is sweeping; default 2 fields
  sweepLimitDeg?: number
}

export interface DetectedPause {
  bearing: number
  positionAngle: number
  fieldDeg: number
  startMs: number
  endMs: number
  dwellMs: number
}

export interface ScanScore {
  pauses: DetectedPause[]
  pauseCount: number
  // mean dwell of the detected pauses, ms (0 when there are none)
  dwellPerPause: number
  coverage: number
  gaps: Gap[]
  sweeping: boolean
  // the longest movement along the bearing with no pause, excluding the sweep back
  sweepDeg: number
  // time of the sweep back to the start, or null when the pass has none
  sweepBackMs: number | null
  // time from the first to the last sample
  passMs: number
}

export const DEFAULT_STOP_TOLERANCE_DEG = 0.5

interface Segment {
  fromIndex: number
  toIndex: number
}

/**
 * Scores a recorded pass. A stop is a run of samples that stay within toleranceDeg (in bearing
 * and in position angle) of the run's first sample for at least minDwellMs; its position is the
 * mean of the run. Between stops the field moves; a backward movement of at least half the
 * sector (the last one) is the sweep back; any other movement of more than sweepLimitDeg along
 * the bearing without a stop is sweeping.
 */
export function scorePass(input: ScorePassInput): ScanScore {
  const { settings } = input
  checkSettings(settings)
  const minDwellMs = input.minDwellMs ?? settings.dwellMs
  const tol = input.toleranceDeg ?? DEFAULT_STOP_TOLERANCE_DEG
  const sweepLimit = input.sweepLimitDeg ?? 2 * settings.fieldDeg
  const samples = [...input.samples].sort((a, b) => a.tMs - b.tMs)
  const n = samples.length

  const pauses: DetectedPause[] = []
  // [first, last] sample indices of each stop
  const stopRuns: [number, number][] = []
  let i = 0
  while (i < n) {
    const anchor = samples[i]!
    let j = i
    while (
      j + 1 < n
      && Math.abs(bearingDelta(anchor.bearing, samples[j + 1]!.bearing)) <= tol + EPS
      && Math.abs(samples[j + 1]!.positionAngle - anchor.positionAngle) <= tol + EPS
    ) j++
    // The field holds the run's last position until the next sample moves it.
    const endMs = j + 1 < n ? samples[j + 1]!.tMs : samples[j]!.tMs
    const dwellMs = endMs - anchor.tMs
    if (dwellMs >= minDwellMs && dwellMs > 0) {
      const run = samples.slice(i, j + 1)
      const bearingOffset = run.reduce((sum, s) => sum + bearingDelta(anchor.bearing, s.bearing), 0) / run.length
      pauses.push({
        bearing: normalizeBearing(anchor.bearing + bearingOffset),
        positionAngle: run.reduce((sum, s) => sum + s.positionAngle, 0) / run.length,
        fieldDeg: anchor.fieldDeg ?? settings.fieldDeg,
        startMs: anchor.tMs,
        endMs,
        dwellMs,
      })
      stopRuns.push([i, j])
      i = j + 1
    }
    else {
      i++
    }
  }

  // Movements: from the start to the first stop, between stops, from the last stop to the end.
  const segments: Segment[] = []
  if (n > 0) {
    let from = 0
    for (const [first, last] of stopRuns) {
      if (first > from) segments.push({ fromIndex: from, toIndex: first })
      from = last
    }
    if (from < n - 1) segments.push({ fromIndex: from, toIndex: n - 1 })
  }

  const width = sectorWidth(settings.startBearing, settings.endBearing)
  let sweepBack: Segment | null = null
  const moves = segments.map((seg) => {
    let path = 0
    let net = 0
    for (let k = seg.fromIndex; k < seg.toIndex; k++) {
      const d = bearingDelta(samples[k]!.bearing, samples[k + 1]!.bearing)
      path += Math.abs(d)
      net += d
    }
    return { seg, path, net }
  })
  for (const m of moves) {
    if (m.net < 0 && -m.net >= width / 2 - EPS) sweepBack = m.seg
  }
  let sweepDeg = 0
  for (const m of moves) {
    if (m.seg !== sweepBack) sweepDeg = Math.max(sweepDeg, m.path)
  }

  // A stop's field holds until the sample after it, so a movement leaving a stop starts there.
  const departureMs = (seg: Segment): number => {
    const leavesStop = stopRuns.some(([, last]) => last === seg.fromIndex)
    return samples[leavesStop ? seg.fromIndex + 1 : seg.fromIndex]!.tMs
  }

  const { coverage, gaps } = horizonCoverage(settings.startBearing, settings.endBearing, pauses)
  const dwellTotal = pauses.reduce((sum, p) => sum + p.dwellMs, 0)
  return {
    pauses,
    pauseCount: pauses.length,
    dwellPerPause: pauses.length ? dwellTotal / pauses.length : 0,
    coverage,
    gaps,
    sweeping: sweepDeg > sweepLimit + EPS,
    sweepDeg,
    sweepBackMs: sweepBack ? samples[sweepBack.toIndex]!.tMs - departureMs(sweepBack) : null,
    passMs: n > 1 ? samples[n - 1]!.tMs - samples[0]!.tMs : 0,
  }
}

// ---------------------------------------------------------------- contacts in the field

/** Apparent size in CSS pixels of a contact seen through the given optics (7x binoculars or naked eye). */
export function contactApparentPx(sizeM: number, rangeM: number, field: FieldKind): number {
  return apparentPx(sizeM, rangeM, field === 'binoculars' ? BINOCULAR_MAGNIFICATION : 1)
}

/** True when a point of the sky or sea lies inside a circular field centred at the given bearing and position angle. */
export function isInField(
  centre: { bearing: number, positionAngle: number, fieldDeg: number },
  point: { bearing: number, positionAngle: number },
): boolean {
  // Small-angle flat view: bearing differences shrink by cos(position angle) away from the horizon.
  const pa = (centre.positionAngle + point.positionAngle) / 2
  const dx = bearingDelta(centre.bearing, point.bearing) * Math.cos(pa * Math.PI / 180)
  const dy = point.positionAngle - centre.positionAngle
  return Math.hypot(dx, dy) <= centre.fieldDeg / 2 + EPS
}
