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

// A picture of a type shown to teach it (introduction, reveal), at an opaque per-watch address.
export interface TeachingPicture {
  name: string
  aspect: string
  features: Record<string, string>
  // /images/p/<id>.webp, served only to the trainee the watch was issued to; null without a rendering
  imageUrl: string | null
}

// A track's first appearance: named, unmasked, in good light, beside its nearest look-alike. Not a call.
export interface Introduction extends TeachingPicture {
  id: string
  // shown just before this sighting (several before one sighting in list order)
  beforeSightingId: string
  lookAlike: TeachingPicture | null
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
  // introductions still to show, in order (issue 15); absent in older answers
  introductions?: Introduction[]
  // a practice watch (asked for with nothing due): its calls count like any other
  practice?: boolean
  // with nothing due (id null): how many sightings a practice would hold now
  practiceSize?: number
}

export interface CallAnswer {
  // the target type id and the right choice's id, revealed after the call
  id: string
  choiceId: string | null
  name: string
  features: Record<string, string>
  // the answer's picture in good light at the sighting's aspect, for the reveal (after the call only)
  imageUrl?: string | null
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
  // a wrong name: the type that was called, its picture at the same aspect; null for a right call or no call
  called?: TeachingPicture | null
}

export interface PackSighting extends IssuedSighting {
  answer: CallAnswer
  hesitationMs: number
  // each choice's type with its picture at this aspect, for the reveal of a wrong call with no connection
  choiceTypes?: (TeachingPicture & { choiceId: string })[]
}

export interface WatchPack {
  id: string
  deckId: string
  day: string
  hesitationMs: number
  // every name of the deck, for typed answers matched on the phone
  names: { id: string, name: string }[]
  sightings: PackSighting[]
  introductions?: Introduction[]
}

export interface DeckWorkload {
  deckId: string
  title: string
  due: number
  new: number
  openWatchId: string | null
  openLeft: number
  // the next time a track of the deck falls due (epoch ms), null when none was called
  nextDueAt?: number | null
  // how many sightings a practice would hold (tracks called before, at most PRACTICE_SIZE)
  practice?: number
}

export interface WatchToday { day: string, decks: DeckWorkload[] }

export interface TapBaseline { id: string, simpleMs: number, choiceMs: number, trials: number, createdAt: number }
