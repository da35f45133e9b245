// Dates in one style everywhere, in the person's locale (Intl): the browser's language, and on the
// server the request's Accept-Language, kept in state so the page hydrates with the same text.
import { relativeParts } from '#shared/utils/relative-time'

const FALLBACK = 'en-GB'

function pickLocale(tags: readonly string[]): string {
  for (const tag of tags) {
    try {
      const [ok] = Intl.DateTimeFormat.supportedLocalesOf(tag)
      if (ok) return ok
    }
    catch { /* not a language tag */ }
  }
  return FALLBACK
}

// Accept-Language (RFC 9110 §12.5.4): tags in order of their q weight.
function fromHeader(header: string | undefined): string[] {
  if (!header) return []
  return header.split(',').map((part, i) => {
    const [tag, ...params] = part.trim().split(';')
    const q = Number(params.find(p => p.trim().startsWith('q='))?.trim().slice(2) ?? 1)
    return { tag: tag!.trim(), q: Number.isFinite(q) ? q : 0, i }
  }).filter(x => x.tag && x.tag !== '*' && x.q > 0).sort((a, b) => b.q - a.q || a.i - b.i).map(x => x.tag)
}

export function useDates() {
  const header = import.meta.server ? useRequestHeaders(['accept-language'])['accept-language'] : undefined
  const locale = useState<string>('locale', () => pickLocale(import.meta.server ? fromHeader(header) : [...(navigator.languages ?? [navigator.language])]))
  const formatters = computed(() => ({
    day: new Intl.DateTimeFormat(locale.value, { dateStyle: 'medium' }),
    dayShort: new Intl.DateTimeFormat(locale.value, { day: 'numeric', month: 'short' }),
    dateTime: new Intl.DateTimeFormat(locale.value, { dateStyle: 'medium', timeStyle: 'short' }),
    relative: new Intl.RelativeTimeFormat(locale.value, { numeric: 'auto' }),
  }))
  return {
    locale,
    /** A day: "2 Dec 2026" in en-GB. */
    day: (ms: number) => formatters.value.day.format(ms),
    /** A day in a chart or table row, with no year: "2 Dec". */
    dayShort: (ms: number) => formatters.value.dayShort.format(ms),
    /** A moment: "2 Dec 2026, 17:40" in en-GB. */
    dateTime: (ms: number) => formatters.value.dateTime.format(ms),
    /** A time from now: "in 3 hours", "tomorrow", "5 minutes ago". */
    relative: (ms: number, nowMs = Date.now()) => {
      const { value, unit } = relativeParts(ms, nowMs)
      return formatters.value.relative.format(value, unit)
    },
  }
}
