// One requestAnimationFrame loop for the watch: measures the display's frame interval (median of
// the last frame deltas) and hands every frame's timestamp to whoever listens.
const KEEP = 60
// Deltas above this are a stall or a hidden tab, not the display's refresh.
const STALL_MS = 100

export function useFrameClock() {
  const intervalMs = ref(1000 / 60)
  const listeners = new Set<(ts: number) => void>()
  const deltas: number[] = []
  let last = 0
  let handle = 0

  function tick(ts: number) {
    if (last > 0) {
      const d = ts - last
      if (d > 0 && d < STALL_MS) {
        deltas.push(d)
        if (deltas.length > KEEP) deltas.shift()
        if (deltas.length >= 5) {
          const sorted = [...deltas].sort((a, b) => a - b)
          intervalMs.value = sorted[Math.floor(sorted.length / 2)]!
        }
      }
    }
    last = ts
    for (const fn of [...listeners]) fn(ts)
    handle = requestAnimationFrame(tick)
  }

  function start() {
    if (!handle && import.meta.client) handle = requestAnimationFrame(tick)
  }

  function stop() {
    if (handle) cancelAnimationFrame(handle)
    handle = 0
    last = 0
  }

  /** Calls fn on every frame until the returned function is called. */
  function onFrame(fn: (ts: number) => void) {
    listeners.add(fn)
    return () => listeners.delete(fn)
  }

  onMounted(start)
  onBeforeUnmount(stop)
  return { intervalMs: readonly(intervalMs), onFrame, measuredFrames: () => deltas.length }
}

export type FrameClock = ReturnType<typeof useFrameClock>
