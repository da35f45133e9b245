// The running watch on the phone: its sightings in the order still to come, the calls made, the
// preloaded and decoded images, and the frame log the tests read (window.__glintFrames).
// Offline: the watch and its pack are kept in IndexedDB; calls made with no connection are graded
// here with the shared gradeAnswer, queued with their own time and sent in order when it returns.
import { defineStore } from 'pinia'
import { watch as observe } from 'vue'
import type { CallResult, Introduction, IssuedSighting, IssuedWatch, PackSighting, WatchPack } from '#shared/types/watch'
import type { CallInput } from '#shared/schemas/watch'
import { gradeAnswer, RESHOW_GAP } from '#shared/utils/call'
import { isNetworkFailure, offlineWatch } from '~/composables/useOfflineWatch'
import type { QueuedCall, ShownResult, StoredWatch } from '~/composables/useOfflineWatch'

// Retry of a failed sync: doubling from 1 s up to 30 s (common practice, no source).
const RETRY_FIRST_MS = 1000
const RETRY_MAX_MS = 30_000

export type WatchPhase = 'idle' | 'loading' | 'introduction' | 'running' | 'feedback' | 'summary' | 'error'

export interface FrameEntry { sightingId: string, framesShown: number, frameIntervalMs: number }

export interface SyncNotice { id: string, text: string, key?: number }

declare global {
  interface Window { __glintFrames?: readonly FrameEntry[] }
}

export interface LoadedImage { el: HTMLImageElement, background: string }

export const useWatchStore = defineStore('watch', () => {
  const watch = ref<IssuedWatch | null>(null)
  const queue = ref<IssuedSighting[]>([])
  const index = ref(0)
  const results = ref<ShownResult[]>([])
  const voided = ref(0)
  const phase = ref<WatchPhase>('idle')
  const error = ref<string | null>(null)
  const loaded = ref(0)
  const images = shallowRef(new Map<string, LoadedImage>())
  // calls kept on the phone until the server has them
  const waiting = ref(0)
  const syncing = ref(false)
  // refused calls and other-device answers, shown until the trainee has read them
  const notices = ref<SyncNotice[]>([])
  // introductions read (not calls: nothing is sent for them)
  const introsSeen = ref<string[]>([])
  const frames: FrameEntry[] = []
  let pack: WatchPack | null = null
  let extra: IssuedSighting[] = []
  let userId = ''
  let retryMs = RETRY_FIRST_MS
  let retryTimer: ReturnType<typeof setTimeout> | undefined

  const current = computed(() => queue.value[index.value] ?? null)
  const lastResult = computed(() => results.value[results.value.length - 1] ?? null)
  // A sighting runs only once its picture and mask are decoded (its exposure is timed from the first frame).
  const currentReady = computed(() => !!current.value && images.value.has(current.value.imageUrl) && images.value.has(current.value.maskUrl))
  const introductions = computed<Introduction[]>(() => watch.value?.introductions ?? pack?.introductions ?? [])
  // The introduction to read before the current sighting, if one is left.
  const currentIntro = computed(() => {
    const s = current.value
    if (!s) return null
    const seen = new Set(introsSeen.value)
    return introductions.value.find(i => i.beforeSightingId === s.id && !seen.has(i.id)) ?? null
  })
  // "Sighting n of N" counts first sightings only; re-shows of missed ones are counted apart.
  const progress = computed(() => {
    const upTo = queue.value.slice(0, index.value + 1)
    return {
      n: upTo.filter(s => !s.reshow).length,
      total: queue.value.filter(s => !s.reshow).length,
      reshow: current.value?.reshow ? upTo.filter(s => s.reshow).length : 0,
      reshows: queue.value.filter(s => s.reshow).length,
    }
  })

  // Sightings run once their introductions (if any) have been read.
  function enterSighting() {
    phase.value = currentIntro.value ? 'introduction' : 'running'
  }

  /** The current introduction has been read: the next one, or the sighting. */
  function seeIntroduction() {
    const i = currentIntro.value
    if (!i || phase.value !== 'introduction') return
    introsSeen.value = [...introsSeen.value, i.id]
    enterSighting()
    void persist()
  }

  const introUrls = (list: Introduction[]) => list.flatMap(i => [i.imageUrl, i.lookAlike?.imageUrl]).filter((u): u is string => !!u)
  // The pictures reveals show (the answer's, and each choice's for a wrong call): fetched once in the
  // background so the service worker keeps them for a reveal with no connection.
  const revealUrls = (p: WatchPack | null) => (p?.sightings ?? [])
    .flatMap(s => [s.answer.imageUrl, ...(s.choiceTypes ?? []).map(c => c.imageUrl)]).filter((u): u is string => !!u)

  if (import.meta.client && !Object.getOwnPropertyDescriptor(window, '__glintFrames')) {
    Object.defineProperty(window, '__glintFrames', { get: () => Object.freeze(frames.map(f => ({ ...f }))), configurable: false })
  }

  // Each image is usable as soon as it is decoded, so a sighting waits for its own pictures only.
  async function preload(urls: string[]) {
    loaded.value = 0
    await Promise.all([...new Set(urls)].map(async (url) => {
      if (images.value.has(url)) {
        loaded.value++
        return
      }
      const el = new Image()
      el.decoding = 'async'
      el.src = url
      await el.decode()
      images.value = new Map(images.value).set(url, { el, background: url.startsWith('/masks/') ? '#000' : cornerColour(el) })
      loaded.value++
    }))
  }

  // Each image fetched once, so the service worker keeps it for a watch with no connection.
  function warm(urls: string[]) {
    return Promise.allSettled([...new Set(urls)].map(u => fetch(u, { credentials: 'same-origin' })))
  }

  // A sighting reached before the background loading brought its pictures loads them now.
  observe([current, phase], async () => {
    const s = current.value
    if (!import.meta.client || !s || phase.value !== 'running' || currentReady.value) return
    try {
      await preload([s.imageUrl, s.maskUrl])
    }
    catch {
      error.value = 'The pictures of this sighting did not load. Check the connection, then open the watch again: your calls so far are kept.'
      phase.value = 'error'
    }
  })

  async function persist() {
    const w = watch.value
    if (!import.meta.client || !w?.id || !userId) return
    const answered = new Set(results.value.map(r => r.sightingId))
    const record: StoredWatch = {
      id: w.id,
      userId,
      watch: w,
      pack,
      extra,
      left: queue.value.slice(index.value).filter(s => !answered.has(s.id)).map(s => s.id),
      results: results.value,
      voided: voided.value,
      savedAt: Date.now(),
      introsSeen: introsSeen.value,
    }
    await offlineWatch.save(record).catch(() => {})
  }

  async function countWaiting() {
    if (!import.meta.client || !userId) return
    const all = await offlineWatch.queued(userId).catch(() => [] as QueuedCall[])
    waiting.value = all.filter(c => c.status === 'waiting').length
    const shown = new Set(notices.value.map(n => n.id))
    for (const c of all) {
      if (c.status === 'refused' && !shown.has(`refused-${c.key}`)) {
        notices.value = [...notices.value, { id: `refused-${c.key}`, key: c.key, text: `A call was not counted: ${c.reason}` }]
      }
    }
  }

  /** Binds the store to the signed-in person and sends what is waiting. */
  async function attach(id: string) {
    userId = id
    await countWaiting()
    void sync()
  }

  async function start(deckId?: string, practice = false) {
    phase.value = 'loading'
    error.value = null
    let w: IssuedWatch
    try {
      w = await useWatchApi().issue(deckId, practice)
    }
    catch (e) {
      if (isNetworkFailure(e) && await resume()) return
      error.value = errorMessage(e)
      phase.value = 'error'
      return
    }
    try {
      const waitingIds = new Set((await offlineWatch.queued(userId).catch(() => [] as QueuedCall[])).map(c => c.sightingId))
      const stored = w.id ? await offlineWatch.get(w.id).catch(() => undefined) : undefined
      watch.value = w
      // Calls still on the phone are not shown again: the server will have them.
      queue.value = w.sightings.filter(s => !s.called && !waitingIds.has(s.id))
      index.value = 0
      results.value = stored?.results.filter(r => waitingIds.has(r.sightingId)) ?? []
      voided.value = 0
      introsSeen.value = stored?.introsSeen ?? []
      extra = []
      if (!queue.value.length) {
        phase.value = 'summary'
        return
      }
      // The pack (for calls with no connection) comes while the first pictures load; the watch
      // starts as soon as what it shows first is decoded, and the rest follows in queue order.
      const packed = w.id ? useWatchApi().pack(w.id).catch(() => stored?.pack ?? null) : Promise.resolve(null)
      const urls = queue.value.flatMap(s => [s.imageUrl, s.maskUrl])
      const intros = introUrls(w.introductions ?? [])
      const intro = currentIntro.value
      await preload(intro ? introUrls([intro]) : urls.slice(0, 2))
      enterSighting()
      void (async () => {
        pack = await packed
        await persist()
        await preload([...urls, ...intros]).catch(() => {})
        // Fetched once more after they are shown, so a service worker that took control late keeps them too.
        await warm([...urls, ...intros, ...revealUrls(pack)])
      })()
    }
    catch (e) {
      error.value = errorMessage(e)
      phase.value = 'error'
    }
  }

  /** The stored watch with no connection: true when there is one to go on with. */
  async function resume() {
    if (!import.meta.client || !userId) return false
    const s = await offlineWatch.latest(userId).catch(() => null)
    if (!s) return false
    const all = new Map([...(s.pack?.sightings ?? s.watch.sightings), ...s.extra].map(x => [x.id, x]))
    const left = s.left.map(id => all.get(id)).filter((x): x is IssuedSighting => !!x)
    if (!left.length && !waiting.value) return false
    watch.value = s.watch
    pack = s.pack
    extra = s.extra
    results.value = s.results
    voided.value = s.voided
    introsSeen.value = s.introsSeen ?? []
    queue.value = left
    index.value = 0
    if (!left.length) {
      phase.value = 'summary'
      return true
    }
    try {
      await preload(left.flatMap(x => [x.imageUrl, x.maskUrl]))
      // Introductions' pictures that did not reach the phone show their words alone.
      await preload(introUrls(s.watch.introductions ?? s.pack?.introductions ?? [])).catch(() => {})
    }
    catch {
      error.value = 'The images of this watch are not on this phone. Open the watch again when you are back online.'
      phase.value = 'error'
      return true
    }
    enterSighting()
    return true
  }

  // The phone's grade: the same gradeAnswer and the pack's answer (the server's grade replaces it).
  function gradeHere(s: IssuedSighting, body: CallInput): ShownResult {
    const p = pack?.sightings.find(x => x.id === s.id) as PackSighting | undefined
    const calledAt = body.calledAt ?? Date.now()
    if (!p) {
      return {
        sightingId: s.id, grade: 'missed', correct: false, anticipation: false, calledChoiceId: body.choiceId ?? null,
        answer: { id: '', choiceId: null, name: '', features: {} }, latencyMs: body.latencyMs, calledAt, track: { stage: 'new', due: calledAt }, local: true,
      }
    }
    const { correct, grade, anticipation } = gradeAnswer(body, {
      answerTypeId: p.answer.id, answerChoiceId: p.answer.choiceId, names: () => pack!.names, hesitationMs: p.hesitationMs, windowMs: p.windowMs,
    })
    // A wrong name: the called type and its picture from the pack, as the server's reveal has them.
    const other = !correct && body.choiceId ? p.choiceTypes?.find(c => c.choiceId === body.choiceId) : undefined
    const called = other ? { name: other.name, aspect: other.aspect, features: other.features, imageUrl: other.imageUrl } : null
    return {
      sightingId: s.id, grade, correct, anticipation, calledChoiceId: body.choiceId ?? null, answer: p.answer,
      latencyMs: body.latencyMs, calledAt, track: { stage: 'new', due: calledAt }, local: true, called,
    }
  }

  function showResult(r: ShownResult) {
    const i = results.value.findIndex(x => x.sightingId === r.sightingId)
    const next = results.value.slice()
    if (i >= 0) next[i] = r
    else next.push(r)
    results.value = next
  }

  async function addAppended(appended: IssuedSighting[] | undefined, gap = RESHOW_GAP) {
    if (!appended?.length) return
    extra = [...extra, ...appended]
    await preload(appended.flatMap(a => [a.imageUrl, a.maskUrl])).catch(() => {})
    const q = queue.value.slice()
    q.splice(Math.min(q.length, index.value + 1 + gap), 0, ...appended)
    queue.value = q
  }

  async function queueCall(s: IssuedSighting, body: CallInput) {
    showResult(gradeHere(s, body))
    await offlineWatch.enqueue({ userId, watchId: watch.value!.id!, sightingId: s.id, body, status: 'waiting', queuedAt: Date.now() })
    await countWaiting()
    await persist()
    scheduleSync(navigator.onLine ? retryMs : null)
  }

  async function call(body: CallInput) {
    const s = current.value
    if (!s || phase.value !== 'running') return
    frames.push({ sightingId: s.id, framesShown: body.framesShown, frameIntervalMs: body.frameIntervalMs })
    phase.value = 'feedback'
    const full: CallInput = { ...body, calledAt: Date.now() }
    // With no connection, or calls still waiting (they go first, in order), the call is queued.
    if (!navigator.onLine || waiting.value > 0) return queueCall(s, full)
    try {
      const r = await useWatchApi().call(s.id, full)
      showResult(r)
      await addAppended(r.appended)
      await persist()
    }
    catch (e) {
      if (isNetworkFailure(e)) return queueCall(s, full)
      showResult({ ...gradeHere(s, full), local: false, refused: errorMessage(e) })
      await persist()
    }
  }

  function scheduleSync(delayMs: number | null) {
    clearTimeout(retryTimer)
    if (delayMs !== null) retryTimer = setTimeout(() => void sync(), delayMs)
  }

  /** Sends the queued calls in the order they were made; the server's answer replaces the phone's. */
  async function sync() {
    // With no connection nothing is sent; the browser's online event (online()) sends the queue.
    if (!import.meta.client || syncing.value || !userId || !navigator.onLine) return
    syncing.value = true
    let failed = false
    try {
      for (const c of await offlineWatch.queued(userId)) {
        if (c.status !== 'waiting') continue
        let r: CallResult
        try {
          r = await useWatchApi().call(c.sightingId, c.body)
        }
        catch (e) {
          if (isNetworkFailure(e)) {
            failed = true
            break
          }
          // Refused (too late, voided, no such sighting): kept until the trainee has read why.
          c.status = 'refused'
          c.reason = errorMessage(e)
          await offlineWatch.update(c)
          const shown = results.value.find(x => x.sightingId === c.sightingId)
          if (shown) showResult({ ...shown, local: false, refused: c.reason })
          continue
        }
        // The first call to reach the server stands; a different one was made on another device.
        const otherDevice = r.calledChoiceId !== (c.body.choiceId ?? null) || r.latencyMs !== c.body.latencyMs
        if (otherDevice) {
          notices.value = [...notices.value, { id: `other-${c.sightingId}`, text: `A sighting was answered on another device first: that answer stands (${r.grade}).` }]
        }
        if (watch.value?.id === c.watchId) {
          showResult({ ...r, otherDevice })
          await addAppended(r.appended)
        }
        await offlineWatch.remove(c.key!)
        await countWaiting()
      }
    }
    catch {
      failed = true
    }
    finally {
      syncing.value = false
    }
    await countWaiting()
    await persist()
    if (failed && waiting.value) {
      retryMs = Math.min(RETRY_MAX_MS, retryMs * 2)
      scheduleSync(navigator.onLine ? retryMs : null)
    }
    else {
      retryMs = RETRY_FIRST_MS
    }
  }

  /** Back online: send at once. */
  function online() {
    retryMs = RETRY_FIRST_MS
    void sync()
  }

  async function dismiss(n: SyncNotice) {
    if (n.key !== undefined) await offlineWatch.remove(n.key).catch(() => {})
    notices.value = notices.value.filter(x => x.id !== n.id)
  }

  function next() {
    if (index.value + 1 >= queue.value.length) {
      index.value = queue.value.length
      phase.value = 'summary'
    }
    else {
      index.value++
      enterSighting()
    }
    void persist()
  }

  // A sighting interrupted (tab hidden) is not graded: it goes to the end of the queue. Online, the
  // server voids it and issues a copy (so another device cannot call the one that was seen).
  function voidCurrent() {
    const s = current.value
    if (!s || phase.value !== 'running') return
    const q = queue.value.slice()
    q.splice(index.value, 1)
    q.push(s)
    queue.value = q
    voided.value++
    void persist()
    if (!navigator.onLine) return
    $fetch<{ appended: IssuedSighting[] }>(`/api/sightings/${s.id}/void`, { method: 'POST' })
      .then(async (v) => {
        const copy = v.appended[0]
        if (!copy) return
        await preload([copy.imageUrl, copy.maskUrl])
        extra = [...extra, copy]
        queue.value = queue.value.map(x => (x.id === s.id ? copy : x))
        await persist()
      })
      .catch(() => {})
  }

  function reset() {
    phase.value = 'idle'
    watch.value = null
    queue.value = []
    index.value = 0
    results.value = []
    introsSeen.value = []
  }

  return {
    watch, queue, index, results, voided, phase, error, loaded, images, current, currentReady, lastResult, waiting, syncing, notices,
    currentIntro, progress, attach, start, resume, call, sync, online, dismiss, next, voidCurrent, reset, seeIntroduction,
  }
})
