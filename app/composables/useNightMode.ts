// Night theme: chosen by the person, or by local time (19:00–07:00) when set to auto. The choice
// is stored on the server (PATCH /api/auth/me) and on the phone (localStorage) for offline pages.
export type NightPreference = 'auto' | 'day' | 'night'
const NIGHT_KEY = 'glint-night'

export function useNightMode() {
  const pref = useState<NightPreference>('night-pref', () => 'auto')
  const hour = useState<number>('night-hour', () => new Date().getHours())
  if (import.meta.client) {
    onNuxtReady(() => {
      hour.value = new Date().getHours()
    })
  }
  const on = computed(() => pref.value === 'night' || (pref.value === 'auto' && (hour.value >= 19 || hour.value < 7)))
  return Object.assign(on, {
    setPreference(p: NightPreference) {
      pref.value = p
      if (import.meta.client) {
        try {
          localStorage.setItem(NIGHT_KEY, p)
        }
        catch { /* storage blocked: the server's copy still holds it */ }
      }
    },
    /** The phone's stored choice, if any. */
    storedPreference(): NightPreference | null {
      if (!import.meta.client) return null
      const v = localStorage.getItem(NIGHT_KEY)
      return v === 'auto' || v === 'day' || v === 'night' ? v : null
    },
    preference: pref,
  })
}
