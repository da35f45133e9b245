// How the crew table writes its numbers, shared with the CSV so both show the same figures.

/** A latency in seconds with two decimals: 1234 ms -> "1.23". */
export function secondsText(ms: number): string {
  return (ms / 1000).toFixed(2)
}

/** A share as a whole percentage, one decimal when it matters near a mark: 0.894 -> "89.4". */
export function percentText(share: number): string {
  const p = share * 100
  return Number.isInteger(Math.round(p * 10) / 10) ? String(Math.round(p)) : (Math.floor(p * 10) / 10).toFixed(1)
}

/** A moment as "YYYY-MM-DD HH:MM" in a time zone (IANA name), for people and spreadsheets alike. */
export function localTimeText(ms: number, timeZone: string): string {
  const parts = Object.fromEntries(new Intl.DateTimeFormat('en-GB', {
    timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23',
  }).formatToParts(new Date(ms)).map(p => [p.type, p.value]))
  return `${parts.year}-${parts.month}-${parts.day} ${parts.hour}:${parts.minute}`
}

export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: tz })
    return true
  }
  catch {
    return false
  }
}
