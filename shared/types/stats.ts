// What the crew table, the person page and the confusion views receive from the server.

export interface TrendFigures {
  days: number
  calls: number
  accuracy: number | null
  medianMs: number | null
  // the same figures over the period of the same length just before
  previousAccuracy: number | null
  previousMedianMs: number | null
}

export interface CrewStatsRow {
  userId: string
  name: string
  calls: number
  // of those calls, how many were graded on the phone offline (server-decided, see calls.offline)
  offlineCalls: number
  accuracy: number | null
  medianMs: number | null
  p90Ms: number | null
  ready: boolean
  trend7: TrendFigures
  trend30: TrendFigures
  lastWatchAt: number | null
  tracksDue: number
  missing: string[]
}

export interface DeckRef {
  id: string
  title: string
  hesitationMs: number
}

export interface ReadinessStandardView {
  minAccuracy: number
  minCallsPerTrack: number
  windowDays: number
  // calls graded offline count toward readiness (default false)
  offlineCounts: boolean
}

export interface CrewStats {
  crew: { id: string, name: string }
  standard: ReadinessStandardView
  decks: DeckRef[]
  filters: { deckId: string | null, days: number, aspect: string | null, condition: string | null }
  generatedAt: number
  rows: CrewStatsRow[]
}

export interface TargetTypeRef { id: string, name: string }

export interface CrewConfusions {
  deck: DeckRef | null
  days: number
  types: TargetTypeRef[]
  // counts[i][j]: sightings of types[i] called types[j]
  counts: number[][]
  noCall: number[]
  totals: number[]
}

export interface NamedPair {
  truthId: string
  truthName: string
  calledId: string
  calledName: string
  count: number
  share: number
  aspect?: string
  condition?: string
}

export interface DeckConfusions {
  deck: { id: string, title: string }
  crews: { id: string, name: string }[]
  days: number
  calls: number
  overall: NamedPair[]
  byAspect: NamedPair[]
  byCondition: NamedPair[]
  // the worst pairs at the aspect where they are confused, each type with its features and picture
  sideBySide: SideBySidePair[]
}

export interface PairSide { id: string, name: string, features: Record<string, string>, imageUrl: string | null }
export interface SideBySidePair { aspect: string, count: number, share: number, truth: PairSide, called: PairSide }

export interface BreakdownView {
  key: string
  label: string
  calls: number
  accuracy: number | null
  medianMs: number | null
  p90Ms: number | null
}

export interface DeckReadinessView {
  deckId: string
  title: string
  ready: boolean
  missing: string[]
  accuracy: number | null
  medianMs: number | null
  hesitationMs: number
}

export interface PersonReport {
  person: { id: string, name: string, crews: { id: string, name: string }[] }
  self: boolean
  remindersOptOut: boolean | null
  decks: DeckRef[]
  filters: { deckId: string | null, days: number }
  summary: { calls: number, accuracy: number | null, medianMs: number | null, p90Ms: number | null, lastCallAt: number | null }
  // right calls in time order, and the trailing rolling median over `rollingWindow` of them
  latency: { at: number, ms: number, rolling: number }[]
  rollingWindow: number
  byAspect: BreakdownView[]
  byCondition: BreakdownView[]
  weakest: BreakdownView[]
  confusions: NamedPair[]
  baseline: { simpleMs: number, choiceMs: number, at: number } | null
  // median right-call latency minus the baseline's choice reaction time, never below 0
  netMs: number | null
  readiness: DeckReadinessView[]
  tracksDue: number
}

export interface DigestRunResult {
  kind: 'weekly' | 'daily'
  period: string
  sent: number
  alreadySent: number
  skipped: number
}
