// One call, graded the same way on both sides: the server grades and stores it, the phone grades a
// call made with no connection from the watch's pack (the server's grade stands when it arrives).
import { gradeCall } from './grade'
import type { GradeResult } from './grade'
import { matchTypedAnswer } from './typed-answer'
import type { NamedType } from './typed-answer'

/** Other sightings between a missed sighting and its re-show (product.md). Design value, no source. */
export const RESHOW_GAP = 3

export interface CallMade {
  choiceId?: string | null
  typed?: string
  latencyMs: number | null
}

export interface CallKey {
  answerTypeId: string
  answerChoiceId: string | null
  /** the deck's names, read only for a typed call */
  names: () => readonly NamedType[]
  /** the deck's hesitation limit; null: the whole window */
  hesitationMs: number | null
  windowMs: number
}

export interface GradedCall extends GradeResult {
  correct: boolean
  /** for a typed call: the target type the text names, or null when it names none */
  typedTypeId: string | null
}

/**
 * A choice or typed text graded against the sighting's answer: typed text by matchTypedAnswer, a
 * choice by its id; no call at all is graded missed. The hesitation limit is clamped to the
 * sighting's own window, as gradeCall requires (the limit never above the window).
 */
export function gradeAnswer(call: CallMade, key: CallKey): GradedCall {
  let correct = false
  let typedTypeId: string | null = null
  if (call.typed !== undefined) {
    const match = matchTypedAnswer(call.typed, key.names(), key.answerTypeId)
    correct = match.correct
    typedTypeId = match.matchedId
  }
  else if (call.choiceId) {
    correct = call.choiceId === key.answerChoiceId
  }
  const noCall = !call.choiceId && call.typed === undefined
  const { grade, anticipation } = gradeCall({
    correct,
    latencyMs: noCall ? null : call.latencyMs,
    hesitationMs: Math.min(key.hesitationMs ?? key.windowMs, key.windowMs),
    windowMs: key.windowMs,
  })
  return { correct, typedTypeId, grade, anticipation }
}
