// The running watch on the phone: its sightings in the order still to come, the calls made, the
// preloaded and decoded images, and the frame log the tests read (window.__glintFrames).
import { defineStore } from 'pinia'
import type { CallResult, IssuedSighting, IssuedWatch } from '#shared/types/drill'
import type { CallInput } from '#shared/schemas/drill'

// Other sightings between a missed one and its re-show (product.md; the server's queue uses the same gap).
const RESHOW_GAP = 3

export type WatchPhase = 'idle' | 'loading' | 'running' | 'feedback' | 'summary' | 'error'

export interface FrameEntry { sightingId: string, framesShown: number, frameIntervalMs: number }

declare global {
  interface Window { __glintFrames?: readonly FrameEntry[] }
}

export interface LoadedImage { el: HTMLImageElement, background: string }

export const useWatchStore = defineStore('watch', () => {
  const watch = ref<IssuedWatch | null>(null)
  const queue = ref<IssuedSighting[]>([])
  const index = ref(0)
  const results = ref<CallResult[]>([])
  const voided = ref(0)
  const phase = ref<WatchPhase>('idle')
  const error = ref<string | null>(null)
  const loaded = ref(0)
  const images = shallowRef(new Map<string, LoadedImage>())
  const frames: FrameEntry[] = []

  const current = computed(() => queue.value[index.value] ?? null)
  const lastResult = computed(() => results.value[results.value.length - 1] ?? null)

  if (import.meta.client && !Object.getOwnPropertyDescriptor(window, '__glintFrames')) {
    Object.defineProperty(window, '__glintFrames', { get: () => Object.freeze(frames.map(f => ({ ...f }))), configurable: false })
  }

  // The corner colour of an image, so the box around a scaled-down scene continues its sky.
  function backgroundOf(el: HTMLImageElement) {
    try {
      const c = document.createElement('canvas')
      c.width = 1
      c.height = 1
      const ctx = c.getContext('2d')!
      ctx.drawImage(el, 0, 0, 1, 1, 0, 0, 1, 1)
      const [r, g, b] = ctx.getImageData(0, 0, 1, 1).data
      return `rgb(${r} ${g} ${b})`
    }
    catch {
      return '#8aa0b0'
    }
  }

  async function preload(urls: string[]) {
    const map = new Map(images.value)
    loaded.value = 0
    await Promise.all([...new Set(urls)].map(async (url) => {
      if (map.has(url)) {
        loaded.value++
        return
      }
      const el = new Image()
      el.decoding = 'async'
      el.src = url
      await el.decode()
      map.set(url, { el, background: url.startsWith('/masks/') ? '#000' : backgroundOf(el) })
      loaded.value++
    }))
    images.value = map
  }

  async function start(deckId?: string) {
    phase.value = 'loading'
    error.value = null
    try {
      const w = await useWatchApi().issue(deckId)
      watch.value = w
      queue.value = w.sightings.filter(s => !s.called)
      index.value = 0
      results.value = []
      voided.value = 0
      if (!queue.value.length) {
        phase.value = 'summary'
        return
      }
      await preload(queue.value.flatMap(s => [s.imageUrl, s.maskUrl]))
      phase.value = 'running'
    }
    catch (e) {
      error.value = errorMessage(e)
      phase.value = 'error'
    }
  }

  async function call(body: CallInput) {
    const s = current.value
    if (!s || phase.value !== 'running') return
    frames.push({ sightingId: s.id, framesShown: body.framesShown, frameIntervalMs: body.frameIntervalMs })
    phase.value = 'feedback'
    try {
      const r = await useWatchApi().call(s.id, { ...body, calledAt: Date.now() })
      results.value = [...results.value, r]
      if (r.appended?.length) {
        await preload(r.appended.flatMap(a => [a.imageUrl, a.maskUrl]))
        const q = queue.value.slice()
        // A missed track comes back after at least RESHOW_GAP other sightings (product.md).
        q.splice(Math.min(q.length, index.value + 1 + RESHOW_GAP), 0, ...r.appended)
        queue.value = q
      }
    }
    catch (e) {
      error.value = errorMessage(e)
      phase.value = 'error'
    }
  }

  function next() {
    if (index.value + 1 >= queue.value.length) {
      index.value = queue.value.length
      phase.value = 'summary'
    }
    else {
      index.value++
      phase.value = 'running'
    }
  }

  // A sighting interrupted (tab hidden) is not graded: it goes to the end of the queue.
  function voidCurrent() {
    const s = current.value
    if (!s || phase.value !== 'running') return
    const q = queue.value.slice()
    q.splice(index.value, 1)
    q.push(s)
    queue.value = q
    voided.value++
  }

  function reset() {
    phase.value = 'idle'
    watch.value = null
    queue.value = []
    index.value = 0
    results.value = []
  }

  return { watch, queue, index, results, voided, phase, error, loaded, images, current, lastResult, start, call, next, voidCurrent, reset }
})
