// The watch as the API sends it (see ../shared/design/api.md). Nothing in an issued sighting
// tells which choice is right; the answer comes only in a call's result or in the pack.
import type { CallGrade, TrackStage } from '../utils/grade'

export interface IssuedChoice { id: string, label: string }

export interface IssuedSighting {
  id: string
  position: number
  imageUrl: string
  maskUrl: string
  choices: IssuedChoice[]
  // typed: the trainee types the name; choices is then empty
  answerMode: 'choices' | 'typed'
  // for a new track the image stays until the call, at most exposureMs
  exposureMs: number
  untilCall: boolean
  windowMs: number
  apparentPx: number
  rangeM: number
  binoculars: boolean
  width: number
  height: number
  // already called (an open watch issued again)
  called: boolean
  reshow: boolean
}

export interface IssuedWatch {
  // null when there is nothing to drill now (nothing is stored then)
  id: string | null
  deckId: string
  deckTitle: string
  // the watch day: the UTC date of issue, YYYY-MM-DD
  day: string
  hesitationMs: number
  sightings: IssuedSighting[]
  // epoch ms of the next due track when the watch is empty
  nextDueAt: number | null
}

export interface CallAnswer {
  // the target type id and the right choice's id, revealed after the call
  id: string
  choiceId: string | null
  name: string
  features: Record<string, string>
}

export interface CallResult {
  sightingId: string
  grade: CallGrade
  correct: boolean
  anticipation: boolean
  calledChoiceId: string | null
  answer: CallAnswer
  latencyMs: number | null
  calledAt: number
  track: { stage: TrackStage, due: number }
  appended?: IssuedSighting[]
}

export interface PackSighting extends IssuedSighting {
  answer: CallAnswer
  hesitationMs: number
}

export interface WatchPack {
  id: string
  deckId: string
  day: string
  hesitationMs: number
  // every name of the deck, for typed answers matched on the phone
  names: { id: string, name: string }[]
  sightings: PackSighting[]
}

export interface DeckWorkload {
  deckId: string
  title: string
  due: number
  new: number
  openWatchId: string | null
  openLeft: number
}

export interface WatchToday { day: string, decks: DeckWorkload[] }

export interface TapBaseline { id: string, simpleMs: number, choiceMs: number, trials: number, createdAt: number }
