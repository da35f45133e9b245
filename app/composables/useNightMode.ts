// Night theme: chosen by the person, or by local time (19:00–07:00) when set to auto.
export function useNightMode() {
  const pref = useState<'auto' | 'day' | 'night'>('night-pref', () => 'auto')
  const hour = useState<number>('night-hour', () => new Date().getHours())
  if (import.meta.client) {
    onNuxtReady(() => {
      hour.value = new Date().getHours()
    })
  }
  const on = computed(() => pref.value === 'night' || (pref.value === 'auto' && (hour.value >= 19 || hour.value < 7)))
  return Object.assign(on, {
    setPreference(p: 'auto' | 'day' | 'night') { pref.value = p },
    preference: pref,
  })
}
