import { normalizeBearing } from '#shared/utils/scan-pattern'
import type { ScanSample } from '#shared/utils/scan-pattern'
import { placeScanContacts, scanFieldDeg } from '#shared/utils/scan-scene'
import type { ScanContact, ScanDrillConfig, ScanPassSummary, ScanReport } from '#shared/utils/scan-scene'
import type { ScanDrillSettingsT } from '#shared/schemas/scan'

export const SCAN_STEP_ANIMATION_MS = 150
// Stops are told apart by the samples at each step's start, first frame and end; the periodic
// sample only marks time (a pass body must stay small).
const SAMPLE_EVERY_MS = 500

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
  const drillId = ref<string | null>(null)
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

  const fieldDeg = computed(() => config.value ? scanFieldDeg(config.value.field) : 7)

  const elapsed = () => performance.now() - startedAt
  function sample() {
    const round = (x: number) => Math.round(x * 100) / 100
    samples.push({ tMs: Math.round(elapsed()), bearing: normalizeBearing(round(view.bearing)), positionAngle: round(view.positionAngle) })
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
      // The first frame of a move ends the stop before it.
      if (!anim.sampled) {
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

  function start(settings: ScanDrillSettingsT, options: { drillId: string | null, seed: number }) {
    config.value = settings
    drillId.value = options.drillId
    seed.value = options.seed
    contacts.value = placeScanContacts(settings, options.seed)
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
    state.value = 'running'
    sample()
    timer = setInterval(sample, SAMPLE_EVERY_MS)
    frame = requestAnimationFrame(tick)
  }

  function step(dx: number, dy: number) {
    if (state.value !== 'running' || !config.value) return
    const s = config.value.stepDeg
    const fd = fieldDeg.value
    const top = config.value.mode === 'sky' ? 90 - fd / 2 : Math.max(fd, 10)
    sample()
    target.bearing += dx * s
    target.positionAngle = Math.min(top, Math.max(-fd / 2, target.positionAngle + dy * s))
    anim = { from: { bearing: view.bearing, positionAngle: view.positionAngle }, to: { ...target }, at: performance.now(), sampled: false }
    // Keep the animation on the short way round through north.
    if (anim.to.bearing - anim.from.bearing > 180) anim.from.bearing += 360
    if (anim.from.bearing - anim.to.bearing > 180) anim.from.bearing -= 360
  }

  function addReport(report: ScanReport) {
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
        body: { drillId: drillId.value, seed: seed.value, settings: config.value, samples, contacts: contacts.value, reports: reports.value },
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
