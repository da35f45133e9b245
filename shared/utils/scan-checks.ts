// What a pass sent from the phone must keep to before the server scores it: the things the drill
// itself cannot produce (times out of order or past the pass, a field outside the sector or turned
// faster than a person turns, reports out of order or of contacts not in the scene). Pure: the
// server refuses a pass with the first problem found, the phone keeps its field inside the same limits.

import { scanFieldDeg } from './scan-scene'
import type { ScanContact, ScanDrillConfig, ScanReport } from './scan-scene'
import { bearingDelta, normalizeBearing, sectorWidth } from './scan-pattern'
import type { ScanSample } from './scan-pattern'

// The phone takes a sample at most every 40 ms (design value, see useScanPass).
export const SCAN_SAMPLES_A_SECOND = 25
// The last sample and report may land a frame or a timer tick after the pass's length (design value).
export const SCAN_END_GRACE_MS = 1000
// Fastest turn of the field a lookout can make, a full circle in a second (design value, generous:
// the page moves the field by steps of at most 20°, at most one every 125 ms, about 160° a second).
export const SCAN_MAX_TURN_DEG_PER_S = 360
// The turn is measured over windows this long, so one frame's jump is not read as a speed.
export const SCAN_TURN_WINDOW_MS = 250
// Rounding of the phone's samples (0.01°) and of its animation.
const TOLERANCE_DEG = 0.5

/** Most samples a pass of the given length may hold. */
export function maxScanSamples(lengthS: number): number {
  return lengthS * SCAN_SAMPLES_A_SECOND + SCAN_SAMPLES_A_SECOND
}

/** Lowest and highest position angle of the field's centre the page allows. */
export function scanPositionAngleLimits(config: Pick<ScanDrillConfig, 'mode' | 'field'>): { bottom: number, top: number } {
  const fd = scanFieldDeg(config.field)
  // Surface: up to a field above the horizon (at least 10°); sky: the field's top on the zenith.
  return { bottom: -fd / 2, top: config.mode === 'sky' ? 90 - fd / 2 : Math.max(fd, 10) }
}

/**
 * Where a bearing lies along the sector, in degrees from its start; bearings outside a sector
 * that is not a full circle read as before its start or past its end, whichever is nearer.
 */
export function scanSectorOffset(config: Pick<ScanDrillConfig, 'startBearing' | 'endBearing'>, bearing: number): number {
  const width = sectorWidth(config.startBearing, config.endBearing)
  const rel = normalizeBearing(bearing - config.startBearing)
  return width < 360 && rel > width + (360 - width) / 2 ? rel - 360 : rel
}

/** Angular distance between two centres of the field (the flat view of isInField). */
function turnDeg(a: ScanSample, b: ScanSample): number {
  const cos = Math.cos(((a.positionAngle + b.positionAngle) / 2) * Math.PI / 180)
  return Math.hypot(bearingDelta(a.bearing, b.bearing) * cos, b.positionAngle - a.positionAngle)
}

const sec = (ms: number) => `${(ms / 1000).toFixed(1)} s`
const three = (b: number) => String(Math.round(normalizeBearing(b)) % 360).padStart(3, '0')

export interface ScanPassCheckInput {
  config: ScanDrillConfig
  contacts: readonly ScanContact[]
  samples: readonly ScanSample[]
  reports: readonly ScanReport[]
}

/** The first thing in a pass the drill cannot have produced, as a sentence; null when there is none. */
export function scanPassProblem({ config, contacts, samples, reports }: ScanPassCheckInput): string | null {
  const lengthMs = config.lengthS * 1000
  const endMs = lengthMs + SCAN_END_GRACE_MS
  const max = maxScanSamples(config.lengthS)
  if (samples.length > max) return `samples: a pass of ${config.lengthS} s holds at most ${max} samples; this one has ${samples.length}.`

  const fd = scanFieldDeg(config.field)
  const width = sectorWidth(config.startBearing, config.endBearing)
  const { bottom, top } = scanPositionAngleLimits(config)
  for (let i = 0; i < samples.length; i++) {
    const s = samples[i]!
    const prev = samples[i - 1]
    if (prev && s.tMs < prev.tMs) return `samples: times go backwards at sample ${i + 1} (${s.tMs} ms after ${prev.tMs} ms).`
    if (s.tMs > endMs) return `samples: a sample at ${sec(s.tMs)} is past the pass's length of ${config.lengthS} s.`
    const offset = scanSectorOffset(config, s.bearing)
    // A field whose centre is more than half a field outside the sector shows none of it.
    if (width < 360 && (offset < -fd / 2 - TOLERANCE_DEG || offset > width + fd / 2 + TOLERANCE_DEG)) {
      return `samples: at ${sec(s.tMs)} the field points at ${three(s.bearing)}°, outside the drill's sector ${three(config.startBearing)}°–${three(config.endBearing)}°.`
    }
    if (s.positionAngle < bottom - TOLERANCE_DEG || s.positionAngle > top + TOLERANCE_DEG) {
      return `samples: at ${sec(s.tMs)} the field is at ${s.positionAngle}° of position angle; this drill's field stays between ${bottom}° and ${top}°.`
    }
  }

  // The field's path over every window of SCAN_TURN_WINDOW_MS, and over every longer gap between two samples.
  const windowMaxDeg = SCAN_MAX_TURN_DEG_PER_S * SCAN_TURN_WINDOW_MS / 1000
  const path: number[] = [0]
  for (let i = 1; i < samples.length; i++) path.push(path[i - 1]! + turnDeg(samples[i - 1]!, samples[i]!))
  let j = 0
  for (let i = 1; i < samples.length; i++) {
    const dt = samples[i]!.tMs - samples[i - 1]!.tMs
    const step = path[i]! - path[i - 1]!
    while (samples[j]!.tMs < samples[i]!.tMs - SCAN_TURN_WINDOW_MS) j++
    const turned = Math.max(path[i]! - path[j]!, dt > SCAN_TURN_WINDOW_MS ? step - SCAN_MAX_TURN_DEG_PER_S * (dt - SCAN_TURN_WINDOW_MS) / 1000 : 0)
    if (turned > windowMaxDeg + TOLERANCE_DEG) {
      return `samples: at ${sec(samples[i]!.tMs)} the field turns ${Math.round(turned)}° within ${SCAN_TURN_WINDOW_MS} ms; no lookout turns faster than ${SCAN_MAX_TURN_DEG_PER_S}° a second.`
    }
  }

  const ids = new Set(contacts.map(c => c.id))
  const lastSampleMs = samples.length ? samples[samples.length - 1]!.tMs : 0
  for (let i = 0; i < reports.length; i++) {
    const r = reports[i]!
    const prev = reports[i - 1]
    if (r.contactId !== null && !ids.has(r.contactId)) return `reports: ${r.contactId} is not a contact of this pass's scene.`
    if (r.tapAtMs > lastSampleMs) return `reports: a tap at ${sec(r.tapAtMs)} comes after the last sample of the field (${sec(lastSampleMs)}).`
    if (r.reportedAtMs > endMs) return `reports: a report sent at ${sec(r.reportedAtMs)} is past the pass's length of ${config.lengthS} s.`
    // The report form covers the field: the next tap comes after the report before it was sent.
    if (prev && r.tapAtMs < prev.reportedAtMs) {
      return `reports: report ${i + 1} was tapped at ${sec(r.tapAtMs)}, before report ${i} was sent (${sec(prev.reportedAtMs)}); send them in the order they were made.`
    }
  }
  return null
}
