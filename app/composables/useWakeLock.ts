// Keeps the screen on during a watch where the browser allows it (Screen Wake Lock API). The
// browser releases the lock when the page is hidden, so it is asked for again when it shows.
export function useWakeLock() {
  let sentinel: WakeLockSentinel | null = null
  let wanted = false

  async function request() {
    if (!wanted || sentinel || !('wakeLock' in navigator) || document.visibilityState !== 'visible') return
    try {
      sentinel = await navigator.wakeLock.request('screen')
      sentinel.addEventListener('release', () => {
        sentinel = null
      })
    }
    catch {
      // refused (battery saver, no permission): the watch runs without it
      sentinel = null
    }
  }

  function onVisibility() {
    if (document.visibilityState === 'visible') void request()
  }

  function keepAwake(on: boolean) {
    wanted = on
    if (on) void request()
    else {
      void sentinel?.release().catch(() => {})
      sentinel = null
    }
  }

  onMounted(() => document.addEventListener('visibilitychange', onVisibility))
  onBeforeUnmount(() => {
    document.removeEventListener('visibilitychange', onVisibility)
    keepAwake(false)
  })
  return { keepAwake }
}
