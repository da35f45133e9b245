// An audit entry's detail as fields a person reads: a label for each key, names for ids, words for
// true/false, local dates for times. Pure, so the page and the tests share it.

const LABELS: Record<string, string> = {
  userId: 'Person',
  crewId: 'Crew',
  crewIds: 'Crews',
  checkId: 'Check',
  deckId: 'Deck',
  deckIds: 'Decks',
  definitionId: 'Shared target type',
  from: 'Linked from',
  targetTypeId: 'Target type',
  email: 'E-mail',
  role: 'Role',
  roles: 'Roles',
  disabled: 'Account disabled',
  name: 'Name',
  title: 'Title',
  score: 'Score',
  passed: 'Passed',
  remark: 'Remark',
  reason: 'Reason',
  replaced: 'Earlier links replaced',
  replacedId: 'Replaces invitation',
  period: 'Period',
  to: 'Sent to',
  minAccuracy: 'Minimum accuracy',
  minCallsPerTrack: 'Calls needed a track',
  windowDays: 'Window (days)',
  offlineCounts: 'Offline calls count',
  fields: 'Fields changed',
}

// camelCase to words: "hesitationMs" -> "Hesitation ms".
function words(key: string) {
  const spaced = key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase()
  return spaced.charAt(0).toUpperCase() + spaced.slice(1)
}

export interface DetailField { label: string, value: string }

export function auditDetailFields(detail: Record<string, unknown> | null, names: Record<string, string> = {}, timeZone?: string): DetailField[] {
  if (!detail) return []
  const show = (key: string, v: unknown): string => {
    if (v === null || v === undefined) return '—'
    if (typeof v === 'boolean') return v ? 'yes' : 'no'
    if (typeof v === 'string') return names[v] ?? v
    if (typeof v === 'number') {
      if (/At$/.test(key)) return new Date(v).toLocaleString('en-GB', { timeZone, dateStyle: 'medium', timeStyle: 'short' })
      if (key === 'score' || key === 'minAccuracy') return `${Math.round(v * 100)} %`
      return String(v)
    }
    if (Array.isArray(v)) return v.length ? v.map(x => show(key, x)).join(', ') : 'none'
    return Object.entries(v as Record<string, unknown>).map(([k, x]) => `${words(k)}: ${show(k, x)}`).join('; ')
  }
  return Object.entries(detail).map(([key, v]) => ({ label: LABELS[key] ?? words(key), value: show(key, v) }))
}
