import { DEFAULT_STOP_TOLERANCE_DEG, normalizeBearing, sectorWidth } from '#shared/utils/scan-pattern'
import type { ScanSample } from '#shared/utils/scan-pattern'
import { placeScanContacts, scanFieldDeg } from '#shared/utils/scan-scene'
import { SCAN_SAMPLES_A_SECOND, scanPositionAngleLimits, scanSectorOffset } from '#shared/utils/scan-checks'
import type { ScanContact, ScanDrillConfig, ScanPassSummary, ScanReport } from '#shared/utils/scan-scene'
import type { ScanDrillSettingsT } from '#shared/schemas/scan'

export const SCAN_STEP_ANIMATION_MS = 150
// Stops are told apart by the samples at each step's start, first frame and end; the periodic
// sample only marks time (a pass body must stay small).
const SAMPLE_EVERY_MS = 500
// At most one sample in this long (the server takes at most 25 a second of the pass): a newer
// event sample replaces the one before, a periodic one waits.
const SAMPLE_SPACING_MS = 1000 / SCAN_SAMPLES_A_SECOND
// A step waits this long after the one before: the field never turns faster than a person can
// turn binoculars (a 20° step at most every 125 ms; the server refuses over 360° a second).
const MIN_STEP_INTERVAL_MS = 125

/** A started pass, as POST /api/scan/passes/start answers. */
export interface ScanPassStartInfo {
  id: string
  drillId: string | null
  seed: number
  settings: ScanDrillSettingsT
  issuedAt: number
}

export interface ScanView { bearing: number, positionAngle: number }

export interface ScanPassResult {
  id: string
  coverage: number
  contactsFound: number
  contactsShown: number
  score: ScanPassSummary
}

// One running pass: the clock, the field's place (stepped, animated), its samples and the reports.
export function useScanPass() {
  const config = shallowRef<ScanDrillConfig | null>(null)
  const startId = ref<string | null>(null)
  const seed = ref(0)
  const contacts = shallowRef<ScanContact[]>([])
  const state = ref<'idle' | 'running' | 'sending' | 'done'>('idle')
  const nowMs = ref(0)
  const view = reactive<ScanView>({ bearing: 0, positionAngle: 0 })
  const target = { bearing: 0, positionAngle: 0 }
  const reports = ref<ScanReport[]>([])
  const result = shallowRef<ScanPassResult | null>(null)
  const error = ref<string | null>(null)
  const lastStopMs = ref(0)
  let samples: ScanSample[] = []
  let startedAt = 0
  let frame = 0
  let timer: ReturnType<typeof setInterval> | undefined
  let anim: { from: ScanView, to: ScanView, at: number, sampled: boolean } | null = null
  let lastStepAt = -Infinity

  const fieldDeg = computed(() => config.value ? scanFieldDeg(config.value.field) : 7)

  const elapsed = () => performance.now() - startedAt
  const lengthMs = () => (config.value?.lengthS ?? 0) * 1000
  // An event sample (a step, a stop, the end) replaces one taken less than SAMPLE_SPACING_MS
  // before; a periodic one is skipped then. No sample is taken past the pass's length.
  function sample(periodic = false) {
    const round = (x: number) => Math.round(x * 100) / 100
    const tMs = Math.min(Math.round(elapsed()), lengthMs())
    const last = samples[samples.length - 1]
    if (last && tMs - last.tMs < SAMPLE_SPACING_MS) {
      if (periodic) return
      samples.pop()
    }
    samples.push({ tMs, bearing: normalizeBearing(round(view.bearing)), positionAngle: round(view.positionAngle) })
  }

  function tick() {
    const t = elapsed()
    nowMs.value = t
    if (anim) {
      const f = Math.min(1, (performance.now() - anim.at) / SCAN_STEP_ANIMATION_MS)
      // Ease out: quick to leave, gentle to settle.
      const e = 1 - (1 - f) ** 3
      view.bearing = anim.from.bearing + (anim.to.bearing - anim.from.bearing) * e
      view.positionAngle = anim.from.positionAngle + (anim.to.positionAngle - anim.from.positionAngle) * e
      // The first frame that leaves the stop's tolerance ends the stop before it (a frame that has
      // barely moved would count as part of the stop and shift its place).
      const moved = Math.max(Math.abs(view.bearing - anim.from.bearing), Math.abs(view.positionAngle - anim.from.positionAngle))
      if (!anim.sampled && (moved > DEFAULT_STOP_TOLERANCE_DEG || f >= 1)) {
        anim.sampled = true
        sample()
      }
      if (f >= 1) {
        anim = null
        view.bearing = normalizeBearing(target.bearing)
        target.bearing = view.bearing
        lastStopMs.value = t
        sample()
      }
    }
    if (config.value && t >= config.value.lengthS * 1000) {
      void end()
      return
    }
    frame = requestAnimationFrame(tick)
  }

  function start(started: ScanPassStartInfo) {
    const settings = started.settings
    config.value = settings
    startId.value = started.id
    seed.value = started.seed
    contacts.value = placeScanContacts(settings, started.seed)
    reports.value = []
    result.value = null
    error.value = null
    const fd = scanFieldDeg(settings.field)
    // The first pause of the pattern: the field's left edge on the sector start, the horizon just above its centre.
    view.bearing = normalizeBearing(settings.startBearing + fd / 2)
    view.positionAngle = -fd / 10
    target.bearing = view.bearing
    target.positionAngle = view.positionAngle
    samples = []
    startedAt = performance.now()
    nowMs.value = 0
    lastStopMs.value = 0
    lastStepAt = -Infinity
    state.value = 'running'
    sample()
    timer = setInterval(() => {
      if (elapsed() >= lengthMs()) void end()
      else sample(true)
    }, SAMPLE_EVERY_MS)
    frame = requestAnimationFrame(tick)
  }

  function step(dx: number, dy: number) {
    if (state.value !== 'running' || !config.value) return
    const at = performance.now()
    if (at - lastStepAt < MIN_STEP_INTERVAL_MS) return
    lastStepAt = at
    const c = config.value
    const s = c.stepDeg
    const { bottom, top } = scanPositionAngleLimits(c)
    sample()
    // The field's centre stays on the sector (the server refuses a field wholly outside it).
    const width = sectorWidth(c.startBearing, c.endBearing)
    const offset = scanSectorOffset(c, target.bearing + dx * s)
    target.bearing = width < 360 ? c.startBearing + Math.min(width, Math.max(0, offset)) : target.bearing + dx * s
    target.positionAngle = Math.min(top, Math.max(bottom, target.positionAngle + dy * s))
    anim = { from: { bearing: view.bearing, positionAngle: view.positionAngle }, to: { ...target }, at: performance.now(), sampled: false }
    // Keep the animation on the short way round through north.
    if (anim.to.bearing - anim.from.bearing > 180) anim.from.bearing += 360
    if (anim.from.bearing - anim.to.bearing > 180) anim.from.bearing -= 360
  }

  function addReport(report: ScanReport) {
    if (state.value !== 'running' || report.reportedAtMs > lengthMs()) return
    reports.value = [...reports.value, report]
  }

  function stopClock() {
    cancelAnimationFrame(frame)
    if (timer) clearInterval(timer)
    timer = undefined
  }

  async function end() {
    if (state.value !== 'running' || !config.value) return
    sample()
    stopClock()
    state.value = 'sending'
    try {
      result.value = await $fetch<ScanPassResult>('/api/scan/passes', {
        method: 'POST',
        body: { startId: startId.value, samples, reports: reports.value },
      })
      state.value = 'done'
    }
    catch (e) {
      error.value = errorMessage(e)
      state.value = 'done'
    }
  }

  function reset() {
    stopClock()
    state.value = 'idle'
    result.value = null
    error.value = null
  }

  onBeforeUnmount(stopClock)

  return { config, contacts, state, nowMs, view, reports, result, error, fieldDeg, lastStopMs, start, step, addReport, end, reset, elapsed }
}
