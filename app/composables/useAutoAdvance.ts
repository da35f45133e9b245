// After a call the reveal stays until the trainee taps on; going on by itself is a setting, off by
// default, kept on the phone (localStorage).
const KEY = 'glint-auto-advance'

// Silent reading of plain prose, about 238 words a minute (Brysbaert 2019, J. Memory and Language 109,
// from memory); the reveal stays at least 3 s and a second longer than its words take to read.
const WORDS_PER_MINUTE = 238
const MIN_MS = 3000

/** How long a reveal of this many words stays before going on by itself. */
export function readingMs(words: number) {
  return Math.max(MIN_MS, Math.round((words * 60_000) / WORDS_PER_MINUTE) + 1000)
}

export function useAutoAdvance() {
  const on = useState<boolean>('auto-advance', () => false)
  if (import.meta.client) {
    onNuxtReady(() => {
      try {
        on.value = localStorage.getItem(KEY) === 'on'
      }
      catch { /* storage blocked: off */ }
    })
  }
  function set(v: boolean) {
    on.value = v
    try {
      localStorage.setItem(KEY, v ? 'on' : 'off')
    }
    catch { /* storage blocked: for this visit only */ }
  }
  return { on, set }
}
