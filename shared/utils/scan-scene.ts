// The scan drill's scene: where and when contacts show (seeded, so a pass can be replayed), the
// sky's cloud noise, and the score of a pass's contact reports. Pure: the phone draws the scene
// from it and the server scores the stored pass with the same code.
//
// Apparent size: a contact is drawn at θ = 2·atan(s / 2d) (plane geometry), times 7 through 7x
// binoculars, in CSS pixels of 0.0213° (W3C CSS Values and Units 3), through contactApparentPx.
// Its place in the field uses the field's own scale (the circle's diameter spans the true field),
// because no phone can show a 7x view of a 7° field at the reference pixel's scale.

import type { Condition } from './conditions'
import { seededRng } from './rng'
import { median } from './statistics'
import { rangeForPx, BINOCULAR_MAGNIFICATION } from './apparent-size'
import {
  bearingDelta,
  contactApparentPx,
  DEFAULT_NAKED_EYE_FIELD_DEG,
  isInField,
  normalizeBearing,
  planScan,
  scorePass,
  sectorWidth,
} from './scan-pattern'
import type { FieldKind, Gap, ScanSample, ScanSettings } from './scan-pattern'

export type ScanCategory = 'aircraft' | 'vessel'
export type ScanClosing = 'closing' | 'opening' | 'unknown'

/** A drill's settings (shared/schemas/scan.ts validates them). */
export interface ScanDrillConfig {
  startBearing: number
  endBearing: number
  mode: 'surface' | 'sky'
  field: FieldKind
  stepDeg: number
  dwellMs: number
  contactsPerMinute: number
  conditions: readonly Condition[]
  categories: readonly ScanCategory[]
  lengthS: number
}

export interface ScanContact {
  id: string
  bearing: number
  // of the contact's centre; a vessel's is 0: its mast top stands on the horizon
  positionAngle: number
  shownAtMs: number
  goneAtMs: number
  category: ScanCategory
  rangeM: number
  sizeM: number
  condition: Condition
}

export interface ScanReport {
  contactId: string | null
  tapAtMs: number
  reportedAtMs: number
  category: ScanCategory
  typeName?: string
  bearing: number
  positionAngle: number
  closing: ScanClosing
}

// 7x50 binoculars have a true field of about 7° (common practice, no source).
export const BINOCULAR_FIELD_DEG = 7
// Sweep back to the start at the end of a pass: fast, about a second (common practice, no source).
export const SCAN_SWEEP_BACK_MS = 1000

/** True field of the drill's optics in degrees. */
export function scanFieldDeg(field: FieldKind): number {
  return field === 'binoculars' ? BINOCULAR_FIELD_DEG : DEFAULT_NAKED_EYE_FIELD_DEG
}

/** The pattern module's settings for a drill. */
export function scanPatternSettings(config: ScanDrillConfig): ScanSettings {
  return {
    startBearing: config.startBearing,
    endBearing: config.endBearing,
    fieldDeg: scanFieldDeg(config.field),
    stepDeg: config.stepDeg,
    dwellMs: config.dwellMs,
    sweepBackMs: SCAN_SWEEP_BACK_MS,
    mode: config.mode,
    optics: config.field,
  }
}

const between = (rng: () => number, lo: number, hi: number) => lo + (hi - lo) * rng()
const pick = <T>(rng: () => number, items: readonly T[]): T => items[Math.min(items.length - 1, Math.floor(rng() * items.length))]!

// Invented sizes: the visible mast and superstructure of a vessel hull-down, an aircraft's span.
const SIZE_M: Record<ScanCategory, [number, number]> = { vessel: [12, 30], aircraft: [10, 40] }
// Apparent sizes the drill aims for: small but findable on a phone.
const TARGET_PX: Record<FieldKind, [number, number]> = { 'binoculars': [8, 26], 'naked-eye': [4, 12] }

/** How long each contact stays: longer than one planned pass, so a steady search can find it. */
export function contactVisibleMs(config: ScanDrillConfig): number {
  const plan = planScan(scanPatternSettings(config))
  const ms = Math.round(plan.passMs * 1.25)
  return Math.min(Math.max(ms, 8000), 45_000, config.lengthS * 1000)
}

/**
 * Contacts of one pass, by seed: contactsPerMinute × length of them (at least one), at random
 * bearings inside the sector, ranges that give an apparent size in the drill's band, and times
 * inside the drill; sorted by the time they show, ids c1, c2, ...
 */
export function placeScanContacts(config: ScanDrillConfig, seed: number): ScanContact[] {
  const rng = seededRng(seed)
  const lengthMs = config.lengthS * 1000
  const count = Math.max(1, Math.round(config.contactsPerMinute * config.lengthS / 60))
  const visibleMs = contactVisibleMs(config)
  const width = sectorWidth(config.startBearing, config.endBearing)
  const margin = width >= 360 ? 0 : Math.min(1, width / 4)
  const fieldDeg = scanFieldDeg(config.field)
  const magnification = config.field === 'binoculars' ? BINOCULAR_MAGNIFICATION : 1
  const latestShow = Math.max(0, lengthMs - visibleMs - 1000)

  const raw = Array.from({ length: count }, () => {
    const category = pick(rng, config.categories)
    const condition = pick(rng, config.conditions)
    const bearing = normalizeBearing(config.startBearing + margin + rng() * (width - 2 * margin))
    const [sLo, sHi] = SIZE_M[category]
    const sizeM = Math.round(between(rng, sLo, sHi))
    const [pLo, pHi] = TARGET_PX[config.field]
    const rangeM = Math.round(rangeForPx(sizeM, between(rng, pLo, pHi), magnification) / 10) * 10
    // Aircraft low enough to show in a field held on the horizon, or anywhere under the binocular ceiling in the sky.
    const positionAngle = category === 'vessel'
      ? 0
      : config.mode === 'surface'
        ? between(rng, 0.6, Math.max(1.2, fieldDeg * 0.3))
        : between(rng, 1, config.field === 'binoculars' ? 24 : 60)
    const shownAtMs = Math.round(Math.min(latestShow, 1000) + rng() * Math.max(0, latestShow - 1000))
    return { bearing, positionAngle, shownAtMs, goneAtMs: shownAtMs + visibleMs, category, rangeM, sizeM, condition }
  })
  return raw.sort((a, b) => a.shownAtMs - b.shownAtMs).map((c, i) => ({ id: `c${i + 1}`, ...c }))
}

/** A contact's drawn size in CSS pixels through the drill's optics. */
export function scanContactPx(contact: Pick<ScanContact, 'sizeM' | 'rangeM'>, field: FieldKind): number {
  return contactApparentPx(contact.sizeM, contact.rangeM, field)
}

/** The sun's place in the scene, by seed: a bearing inside or near the sector, 15–35° up. */
export function scanSun(config: Pick<ScanDrillConfig, 'startBearing' | 'endBearing'>, seed: number): { bearing: number, positionAngle: number } {
  const rng = seededRng(seed ^ 0x5EED5)
  const width = sectorWidth(config.startBearing, config.endBearing)
  return { bearing: normalizeBearing(config.startBearing + rng() * width), positionAngle: 15 + rng() * 20 }
}

/**
 * Cloud cover from value noise: four octaves on a lattice that wraps at 360° of bearing, so the
 * sky joins up behind the lookout. Returns a function of (bearing, position angle) in [0, 1).
 */
export function scanCloudNoise(seed: number): (bearing: number, positionAngle: number) => number {
  const hash = (ix: number, iy: number, octave: number) => {
    let h = (seed ^ Math.imul(ix, 0x27D4EB2D) ^ Math.imul(iy, 0x165667B1) ^ Math.imul(octave + 1, 0x1B873593)) >>> 0
    h = Math.imul(h ^ (h >>> 15), 0x85EBCA6B)
    h = Math.imul(h ^ (h >>> 13), 0xC2B2AE35)
    return ((h ^ (h >>> 16)) >>> 0) / 4294967296
  }
  const smooth = (t: number) => t * t * (3 - 2 * t)
  const octaves = [{ cell: 24, amp: 0.5 }, { cell: 12, amp: 0.25 }, { cell: 6, amp: 0.15 }, { cell: 3, amp: 0.1 }]
  return (bearing, positionAngle) => {
    let sum = 0
    octaves.forEach(({ cell, amp }, o) => {
      const period = 360 / cell
      const x = normalizeBearing(bearing) / cell
      // Clouds stretch along the horizon: the vertical lattice is half as coarse.
      const y = (positionAngle + 10) / (cell / 2)
      const x0 = Math.floor(x)
      const y0 = Math.floor(y)
      const fx = smooth(x - x0)
      const fy = smooth(y - y0)
      const xa = x0 % period
      const xb = (x0 + 1) % period
      const top = hash(xa, y0, o) * (1 - fx) + hash(xb, y0, o) * fx
      const bottom = hash(xa, y0 + 1, o) * (1 - fx) + hash(xb, y0 + 1, o) * fx
      sum += amp * (top * (1 - fy) + bottom * fy)
    })
    return sum
  }
}

// ---------------------------------------------------------------- scoring the reports

export interface ScanContactResult {
  id: string
  category: ScanCategory
  condition: Condition
  found: boolean
  // from the moment the contact showed to the tap
  detectMs: number | null
  // from the tap to the report sent
  reportMs: number | null
  bearingErrorDeg: number | null
}

export interface ScanReportResult {
  contactId: string | null
  // the report names a contact that showed, held in a pause's field at the tap, and not reported before
  matched: boolean
  tapAtMs: number
  detectMs: number | null
  reportMs: number
  bearingErrorDeg: number | null
  positionAngleErrorDeg: number | null
  categoryRight: boolean | null
  closing: ScanClosing
}

export interface ScanPassSummary {
  coverage: number
  pauseCount: number
  dwellPerPause: number
  gaps: Gap[]
  sweeping: boolean
  sweepDeg: number
  sweepBackMs: number | null
  passMs: number
  fieldDeg: number
  contactsShown: number
  contactsFound: number
  falseReports: number
  medianDetectMs: number | null
  medianReportMs: number | null
  medianBearingErrorDeg: number | null
  contacts: ScanContactResult[]
  reports: ScanReportResult[]
}

export interface ScanPassInput {
  config: ScanDrillConfig
  samples: readonly ScanSample[]
  contacts: readonly ScanContact[]
  reports: readonly ScanReport[]
}

// A tap may land just after the contact goes, and the field's edge is soft to the eye. Both graces
// are design values, no source: half a second is about two reaction times, half a degree a thin rim.
const TAP_GRACE_MS = 500
const FIELD_EDGE_GRACE_DEG = 0.5
// A tap sooner than this after a contact shows is a guess, not a sighting: responses under
// 100 ms are anticipations (Whelan 2008, "Effective analysis of reaction time data").
export const SCAN_MIN_DETECT_MS = 100

const medianOrNull = (values: number[]) => values.length ? median(values) : null

/**
 * The score of a pass: the search (scorePass of the pattern module: coverage, dwell, gaps,
 * sweeping) and the contacts (found, time to detect, report time, bearing error).
 */
export function scoreScanPass(input: ScanPassInput): ScanPassSummary {
  const settings = scanPatternSettings(input.config)
  const samples = [...input.samples].sort((a, b) => a.tMs - b.tMs)
  const search = scorePass({ settings, samples })
  const endMs = samples.length ? samples[samples.length - 1]!.tMs : 0
  const shown = input.contacts.filter(c => c.shownAtMs <= endMs)
  const byId = new Map(shown.map(c => [c.id, c]))
  const claimed = new Set<string>()

  // A contact counts only when the tap falls inside a pause whose field held the contact while it showed.
  const pauseAt = (tMs: number) => search.pauses.find(p => p.startMs <= tMs && tMs <= p.endMs)
  const reports: ScanReportResult[] = [...input.reports].sort((a, b) => a.tapAtMs - b.tapAtMs).map((r) => {
    const contact = r.contactId ? byId.get(r.contactId) : undefined
    const pause = pauseAt(r.tapAtMs)
    const matched = !!contact && !!pause && !claimed.has(contact.id)
      && r.tapAtMs >= contact.shownAtMs + SCAN_MIN_DETECT_MS && r.tapAtMs <= contact.goneAtMs + TAP_GRACE_MS
      && isInField({ bearing: pause.bearing, positionAngle: pause.positionAngle, fieldDeg: pause.fieldDeg + 2 * FIELD_EDGE_GRACE_DEG }, contact)
    if (matched) claimed.add(contact.id)
    return {
      contactId: r.contactId,
      matched,
      tapAtMs: r.tapAtMs,
      detectMs: matched ? r.tapAtMs - contact.shownAtMs : null,
      reportMs: r.reportedAtMs - r.tapAtMs,
      bearingErrorDeg: matched ? Math.abs(bearingDelta(contact.bearing, r.bearing)) : null,
      positionAngleErrorDeg: matched ? Math.abs(contact.positionAngle - r.positionAngle) : null,
      categoryRight: matched ? contact.category === r.category : null,
      closing: r.closing,
    }
  })

  const contacts: ScanContactResult[] = shown.map((c) => {
    const report = reports.find(r => r.matched && r.contactId === c.id)
    return {
      id: c.id,
      category: c.category,
      condition: c.condition,
      found: !!report,
      detectMs: report?.detectMs ?? null,
      reportMs: report?.reportMs ?? null,
      bearingErrorDeg: report?.bearingErrorDeg ?? null,
    }
  })
  const found = reports.filter(r => r.matched)
  return {
    coverage: search.coverage,
    pauseCount: search.pauseCount,
    dwellPerPause: search.dwellPerPause,
    gaps: search.gaps,
    sweeping: search.sweeping,
    sweepDeg: search.sweepDeg,
    sweepBackMs: search.sweepBackMs,
    passMs: search.passMs,
    fieldDeg: settings.fieldDeg,
    contactsShown: shown.length,
    contactsFound: found.length,
    falseReports: reports.length - found.length,
    medianDetectMs: medianOrNull(found.map(r => r.detectMs!)),
    medianReportMs: medianOrNull(reports.map(r => r.reportMs)),
    medianBearingErrorDeg: medianOrNull(found.map(r => r.bearingErrorDeg!)),
    contacts,
    reports,
  }
}
