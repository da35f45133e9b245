// Passes of the scan drill as the phone makes them: started by the server, sent with the field's
// samples and the reports, no sooner than the time they claim has passed.
import { planScan } from '../../shared/utils/scan-pattern'
import { placeScanContacts, scanPatternSettings } from '../../shared/utils/scan-scene'
import type { ScanContact, ScanDrillConfig } from '../../shared/utils/scan-scene'
import type { Client } from './client'

export interface Sample { tMs: number, bearing: number, positionAngle: number }
export interface Report {
  contactId: string | null
  tapAtMs: number
  reportedAtMs: number
  category: 'aircraft' | 'vessel'
  bearing: number
  positionAngle: number
  closing: 'closing' | 'opening' | 'unknown'
}
export interface Started { id: string, seed: number, settings: ScanDrillConfig, issuedAt: number, at: number }

export async function startPass(c: Client, body: { drillId: string | null, lengthS?: number, seed?: number }): Promise<Started> {
  const r = await c.post('/api/scan/passes/start', body)
  if (r.status !== 201) throw new Error(`start: ${r.status} ${r.text}`)
  return { ...r.body, at: Date.now() }
}

const sleep = (ms: number) => new Promise(resolve => setTimeout(resolve, ms))

// Sends a pass once as much time has passed since its start as its last sample claims.
export async function sendPass(c: Client, start: Started, samples: Sample[], reports: Report[] = [], extra: Record<string, unknown> = {}) {
  const lastMs = samples[samples.length - 1]?.tMs ?? 0
  await sleep(Math.max(0, start.at + lastMs + 50 - Date.now()))
  return c.post('/api/scan/passes', { startId: start.id, samples, reports, ...extra })
}

// A lookout holds each centre for 1 s, sampled every 100 ms, 0.7° below the horizon.
export function track(centres: number[]): Sample[] {
  const samples: Sample[] = []
  centres.forEach((bearing, k) => {
    for (let d = 0; d < 1000; d += 100) samples.push({ tMs: k * 1000 + d, bearing, positionAngle: -0.7 })
  })
  samples.push({ tMs: centres.length * 1000, bearing: centres[centres.length - 1]! + 1, positionAngle: -0.7 })
  return samples
}

/** A seed whose scene has a contact that fits, searched from 1 upwards. */
export function seedWith(config: ScanDrillConfig, fits: (c: ScanContact) => boolean): { seed: number, contact: ScanContact } {
  for (let seed = 1; seed < 50_000; seed++) {
    const contact = placeScanContacts(config, seed).find(fits)
    if (contact) return { seed, contact }
  }
  throw new Error('no seed has such a contact')
}

/**
 * The phone's samples for a pass that follows the planned pattern (planScan): at each pause a
 * sample on arrival and every 500 ms, one as the step starts and one on its first frame (16 ms,
 * a fifth of the way), the next pause reached 150 ms after the step; then the sweep back to the
 * first pause in 1 s, a sample every 50 ms. Returns the samples and each pause's span.
 */
export function drivePattern(config: ScanDrillConfig): { samples: Sample[], pauses: { bearing: number, positionAngle: number, fromMs: number, toMs: number }[] } {
  const plan = planScan(scanPatternSettings(config))
  const samples: Sample[] = []
  const pauses: { bearing: number, positionAngle: number, fromMs: number, toMs: number }[] = []
  let t = 0
  plan.pauses.forEach((p, k) => {
    const at = { bearing: p.bearing, positionAngle: p.positionAngle }
    for (let d = 0; d < config.dwellMs; d += 500) samples.push({ tMs: t + d, ...at })
    samples.push({ tMs: t + config.dwellMs, ...at })
    pauses.push({ ...at, fromMs: t, toMs: t + config.dwellMs + 16 })
    const next = plan.pauses[k + 1]
    if (next) {
      samples.push({ tMs: t + config.dwellMs + 16, bearing: p.bearing + (next.bearing - p.bearing) / 5, positionAngle: p.positionAngle + (next.positionAngle - p.positionAngle) / 5 })
      t += config.dwellMs + 150
    }
    else t += config.dwellMs
  })
  // Back to the first pause in 1 s, a sample every 50 ms.
  const last = plan.pauses[plan.pauses.length - 1]!
  const first = plan.pauses[0]!
  for (let k = 1; k <= 20; k++) {
    samples.push({ tMs: t + k * 50, bearing: last.bearing + (first.bearing - last.bearing) * k / 20, positionAngle: last.positionAngle })
  }
  return { samples, pauses }
}
