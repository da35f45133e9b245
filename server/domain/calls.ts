// A call on a sighting, above watches and checks: reads the sighting, refuses what no call may be
// made on (another trainee's, a voided one, one issued too long ago), grades the choice or typed
// text, and hands the graded call to the watch (feedback, FSRS, re-show) or to the check (stored,
// no feedback). Plain imports, like watches.ts: the demo history seed runs this code.
import type { Database } from 'better-sqlite3'
import { createError } from 'h3'
import type { PlannedChoice } from '../core/watch/plan'
import { gradeAnswer } from '../../shared/utils/call'
import type { CallInput } from '../../shared/schemas/watch'
import type { CheckCallRecorded } from '../../shared/schemas/checks'
import type { CallResult } from '../../shared/types/watch'
import { inGroupCommit } from '../utils/group-commit'
import { useSqlite } from '../utils/db'
import { statement } from '../utils/sql'
import { recordCheckCall } from './checks'
import { sightingForCall } from './sightings'
import type { CallFields } from './sightings'
import { recordWatchCall, serverRandom, VOIDED_MESSAGE } from './watches'
import type { WatchRandom } from './watches'

// An offline call may be applied at its own time up to this long after the sighting was issued.
export const CALL_LATE_LIMIT_MS = 36 * 3_600_000
// A call made this long before it reached the server counts as made offline.
const OFFLINE_AFTER_MS = 30_000

/**
 * Takes one call: graded by gradeAnswer at the call's own time (calledAt bounded to [issuedAt, now];
 * more than CALL_LATE_LIMIT_MS after issue is refused), stored once (a resend gets the first stored
 * result). Another trainee's sighting answers 404, as an unknown one.
 */
export function callSighting(sqlite: Database, userId: string, sightingId: string, input: CallInput, nowMs = Date.now(), random: WatchRandom = serverRandom): CallResult | CheckCallRecorded {
  const s = sightingForCall(sqlite, sightingId)
  if (!s || s.userId !== userId || !s.deckId) throw createError({ statusCode: 404, message: 'No such sighting was issued to you.' })
  if (s.result !== null) return JSON.parse(s.result) as CallResult | CheckCallRecorded
  if (s.voidedAt !== null) throw createError({ statusCode: 409, message: VOIDED_MESSAGE })

  const calledAt = Math.min(Math.max(input.calledAt ?? nowMs, s.issuedAt), nowMs)
  if (calledAt - s.issuedAt > CALL_LATE_LIMIT_MS) {
    throw createError({ statusCode: 409, message: 'This sighting was issued more than 36 hours before the call; start today\'s watch for fresh ones.' })
  }
  const choices = JSON.parse(s.choices) as PlannedChoice[]
  const choice = input.typed === undefined && input.choiceId ? choices.find(c => c.id === input.choiceId) : undefined
  if (input.typed === undefined && input.choiceId && !choice) throw createError({ statusCode: 400, message: 'choiceId: That choice does not belong to this sighting.' })
  const choiceId = choice?.id ?? null
  const deckId = s.deckId
  const { correct, grade, anticipation, typedTypeId } = gradeAnswer({ choiceId, typed: input.typed, latencyMs: input.latencyMs }, {
    answerTypeId: s.targetTypeId,
    answerChoiceId: s.answerChoiceId,
    names: () => statement<{ id: string, name: string }, [string]>(sqlite, 'SELECT id, name FROM target_types WHERE deck_id = ?').all(deckId),
    hesitationMs: s.hesitationMs,
    windowMs: s.windowMs,
  })
  const call: CallFields = {
    sightingId, userId, deckId, trackId: s.trackId, kind: s.kind === 'check' ? 'check' : 'watch', targetTypeId: s.targetTypeId,
    calledTypeId: input.typed !== undefined ? typedTypeId : choice?.typeId ?? null, aspect: s.aspect, condition: s.condition, choiceId,
    typed: input.typed ?? null, correct, grade, anticipation, latencyMs: input.latencyMs, framesShown: input.framesShown,
    frameIntervalMs: input.frameIntervalMs, calledAt, offline: nowMs - calledAt > OFFLINE_AFTER_MS,
  }
  // A check's call gives no feedback and leaves the tracks alone (checks.ts).
  if (call.kind === 'check') return recordCheckCall(sqlite, s.watchId, call, nowMs)
  return recordWatchCall(sqlite, s, choices, call, nowMs, random)
}

/**
 * A call from the API: on the server's database, in the group commit of the calls that arrive
 * together (server/utils/group-commit.ts); resolves once the call is stored.
 */
export function takeCall(userId: string, sightingId: string, input: CallInput): Promise<CallResult | CheckCallRecorded> {
  const sqlite = useSqlite()
  return inGroupCommit(sqlite, () => callSighting(sqlite, userId, sightingId, input))
}
