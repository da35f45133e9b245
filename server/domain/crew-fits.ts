// Each crew's FSRS parameters on the database: the fit (weekly, and when an instructor or lead
// asks) runs in a child process (fit-process.ts; the route answers before it ends, and a crash of
// the optimizer fails that fit only), its state and figures in `crew_fsrs_params`, and the weights
// the scheduler uses for a trainee's call. Plain imports, so the seed and scripts can use it; it
// works on the handle it is given through statement() (server/utils/sql.ts): one read is on every call.
import type { Database } from 'better-sqlite3'
import { default_w } from 'ts-fsrs'
import { byTrack, calibration, firstCurve, forgettingByGap, MIN_FIT_CALLS, MIN_PERSON_CALLS } from '../core/scheduling/fit'
import type { ReviewLog } from '../core/scheduling/fit'
import type { CrewFitView, PersonFitView } from '../../shared/types/fit'
import type { CallGrade } from '../../shared/utils/grade'
import { fitInChild } from '../utils/fit-process'
import { statement } from '../utils/sql'

interface Row {
  crewId: string
  status: CrewFitView['status']
  progress: number
  message: string | null
  calls: number
  tracks: number
  needed: number
  defaultLogLoss: number | null
  defaultRmse: number | null
  fittedLogLoss: number | null
  fittedRmse: number | null
  fittedWeights: string | null
  adoptedWeights: string | null
  finishedAt: number | null
}

const SELECT_ROW = `SELECT crew_id AS crewId, status, progress, message, calls, tracks, needed, default_log_loss AS defaultLogLoss,
  default_rmse AS defaultRmse, fitted_log_loss AS fittedLogLoss, fitted_rmse AS fittedRmse, fitted_weights AS fittedWeights,
  adopted_weights AS adoptedWeights, finished_at AS finishedAt FROM crew_fsrs_params WHERE crew_id = ?`

// The calls of a crew's members on the crew's decks that reviewed a track (checks review none).
const CREW_LOGS = `SELECT c.track_id AS trackId, c.called_at AS calledAt, c.grade, c.user_id AS userId FROM calls c
  JOIN memberships m ON m.user_id = c.user_id AND m.crew_id = ?
  JOIN deck_crews dc ON dc.deck_id = c.deck_id AND dc.crew_id = m.crew_id
  WHERE c.track_id IS NOT NULL ORDER BY c.track_id, c.called_at`

export function crewReviewLogs(sqlite: Database, crewId: string): (ReviewLog & { userId: string })[] {
  return statement<{ trackId: string, calledAt: number, grade: CallGrade, userId: string }, [string]>(sqlite, CREW_LOGS).all(crewId)
}

// ---------------------------------------------------------------- the weights a call uses

// crew id → adopted weights (null: defaults); cleared when a fit ends. The trainee's crew is looked
// up on every call (one indexed read), so a move to another crew takes effect at once.
const adoptedCache = new Map<string, readonly number[] | null>()

/** The adopted weights for a trainee's call on a deck: those of the trainee's crew the deck is assigned to (first by id). */
export function weightsForCall(sqlite: Database, userId: string, deckId: string): readonly number[] | undefined {
  // Prepared once per handle (server/utils/sql.ts): this runs on every call of a watch.
  const row = statement<{ crewId: string }, [string, string]>(sqlite, `SELECT m.crew_id AS crewId FROM memberships m
    JOIN deck_crews dc ON dc.crew_id = m.crew_id AND dc.deck_id = ? WHERE m.user_id = ? ORDER BY m.crew_id LIMIT 1`).get(deckId, userId)
  return weightsOfCrew(sqlite, row?.crewId ?? null)
}

/** The adopted weights of a crew (undefined: the defaults; so for no crew), cached until a fit ends. */
export function weightsOfCrew(sqlite: Database, crewId: string | null): readonly number[] | undefined {
  if (crewId === null) return undefined
  let weights = adoptedCache.get(crewId)
  if (weights === undefined) {
    const fit = statement<{ w: string | null }, [string]>(sqlite, 'SELECT adopted_weights AS w FROM crew_fsrs_params WHERE crew_id = ?').get(crewId)
    weights = fit?.w ? JSON.parse(fit.w) as number[] : null
    adoptedCache.set(crewId, weights)
  }
  return weights ?? undefined
}

/** Forget the cached weights (a fit ended). */
export function forgetCrewWeights(): void {
  adoptedCache.clear()
}

// ---------------------------------------------------------------- running a fit

const running = new Map<string, Promise<void>>()

/**
 * Starts a fit of the crew's parameters unless one is running; returns at once. The row shows
 * progress while it runs. Too few calls: the defaults stay and the row says how many more.
 */
export function startCrewFit(sqlite: Database, crewId: string, requestedBy: string | null, nowMs = Date.now()): Promise<void> {
  const busy = running.get(crewId)
  if (busy) return busy
  statement<unknown, [string, string | null, number, number]>(sqlite, `INSERT INTO crew_fsrs_params (crew_id, status, progress, message, requested_by, started_at, updated_at)
    VALUES (?, 'running', 0, NULL, ?, ?, ?)
    ON CONFLICT (crew_id) DO UPDATE SET status = 'running', progress = 0, message = NULL, requested_by = excluded.requested_by,
    started_at = excluded.started_at, updated_at = excluded.updated_at`).run(crewId, requestedBy, nowMs, nowMs)
  const job = runCrewFit(sqlite, crewId).finally(() => running.delete(crewId))
  running.set(crewId, job)
  return job
}

async function runCrewFit(sqlite: Database, crewId: string): Promise<void> {
  const setProgress = statement<unknown, [number, number, string]>(sqlite, 'UPDATE crew_fsrs_params SET progress = ?, updated_at = ? WHERE crew_id = ?')
  let last = 0
  try {
    // let the route answer before the calls are read
    await new Promise(resolve => setImmediate(resolve))
    const logs = crewReviewLogs(sqlite, crewId).map(({ trackId, calledAt, grade }) => ({ trackId, calledAt, grade }))
    const out = await fitInChild(logs, {
      onProgress: (share) => {
        if (share - last >= 0.05) {
          last = share
          setProgress.run(share, Date.now(), crewId)
        }
      },
    })
    const now = Date.now()
    if (out.status === 'too-few') {
      statement(sqlite, `UPDATE crew_fsrs_params SET status = 'too-few', progress = 1, calls = ?, tracks = ?, needed = ?,
        message = ?, finished_at = ?, updated_at = ? WHERE crew_id = ?`)
        .run(out.calls, out.tracks, out.needed, `${out.needed} more calls are needed before a fit is tried; the crew stays on the default parameters.`, now, now, crewId)
      return
    }
    const message = out.adopted
      ? 'The fitted parameters predicted unseen calls better than the defaults and are now used for this crew.'
      : 'The fitted parameters did not predict unseen calls better than the defaults; the crew stays on the defaults.'
    statement(sqlite, `UPDATE crew_fsrs_params SET status = 'done', progress = 1, calls = ?, tracks = ?, needed = 0, message = ?,
      default_log_loss = ?, default_rmse = ?, fitted_log_loss = ?, fitted_rmse = ?, fitted_weights = ?, adopted_weights = ?,
      finished_at = ?, updated_at = ? WHERE crew_id = ?`)
      .run(out.calls, out.tracks, message, out.defaults.logLoss, out.defaults.rmse, out.fitted.logLoss, out.fitted.rmse,
        JSON.stringify(out.weights), out.adopted ? JSON.stringify(out.weights) : null, now, now, crewId)
  }
  catch (error) {
    const now = Date.now()
    statement(sqlite, `UPDATE crew_fsrs_params SET status = 'failed', message = ?, finished_at = ?, updated_at = ? WHERE crew_id = ?`)
      .run(`The fit failed (${error instanceof Error ? error.message : String(error)}); the crew keeps the parameters it had.`, now, now, crewId)
  }
  finally {
    forgetCrewWeights()
  }
}

/** Fits every crew in turn (the weekly task). */
export async function fitAllCrews(sqlite: Database): Promise<{ crews: number }> {
  const crews = statement<string, []>(sqlite, 'SELECT id FROM crews ORDER BY id', 'pluck').all()
  for (const crewId of crews) await startCrewFit(sqlite, crewId, null)
  return { crews: crews.length }
}

// ---------------------------------------------------------------- the view

const CURVE_DAYS = Array.from({ length: 31 }, (_, i) => i)

export function crewFitView(sqlite: Database, crewId: string): CrewFitView {
  const row = statement<Row, [string]>(sqlite, SELECT_ROW).get(crewId)
  const fittedWeights = row?.fittedWeights ? JSON.parse(row.fittedWeights) as number[] : null
  const logs = crewReviewLogs(sqlite, crewId)
  const tracks = byTrack(logs)
  const calls = tracks.reduce((s, t) => s + t.length, 0)
  return {
    crewId,
    status: row?.status ?? 'idle',
    progress: row?.progress ?? 0,
    message: row?.message ?? (calls < MIN_FIT_CALLS ? `${MIN_FIT_CALLS - calls} more calls are needed before a fit is tried.` : null),
    calls: row && row.status !== 'idle' && row.status !== 'running' ? row.calls : calls,
    tracks: row && row.status !== 'idle' && row.status !== 'running' ? row.tracks : tracks.length,
    needed: row?.needed ?? Math.max(0, MIN_FIT_CALLS - calls),
    minCalls: MIN_FIT_CALLS,
    defaults: { logLoss: row?.defaultLogLoss ?? null, rmse: row?.defaultRmse ?? null },
    fitted: { logLoss: row?.fittedLogLoss ?? null, rmse: row?.fittedRmse ?? null },
    adopted: !!row?.adoptedWeights,
    finishedAt: row?.finishedAt ?? null,
    curve: { days: CURVE_DAYS, defaults: firstCurve(default_w, CURVE_DAYS), fitted: fittedWeights ? firstCurve(fittedWeights, CURVE_DAYS) : null },
    calibration: { defaults: calibration(tracks, undefined), fitted: fittedWeights ? calibration(tracks, fittedWeights) : null },
    people: peopleOf(sqlite, logs, row?.adoptedWeights ? JSON.parse(row.adoptedWeights) as number[] : undefined),
  }
}

/** Each person with calls on the crew's decks: their calls against the crew's parameters in use. */
function peopleOf(sqlite: Database, logs: readonly (ReviewLog & { userId: string })[], inUse: readonly number[] | undefined): PersonFitView[] {
  const byUser = new Map<string, ReviewLog[]>()
  for (const log of logs) {
    const list = byUser.get(log.userId)
    if (list) list.push(log)
    else byUser.set(log.userId, [log])
  }
  const nameOf = statement<string, [string]>(sqlite, 'SELECT name FROM users WHERE id = ?', 'pluck')
  return [...byUser].map(([userId, own]) => {
    const tracks = byTrack(own)
    // a prediction is made for every call after a track's first
    const calls = own.length - tracks.length
    const enough = calls >= MIN_PERSON_CALLS
    return {
      userId,
      name: nameOf.get(userId) ?? 'Unknown',
      calls,
      needed: Math.max(0, MIN_PERSON_CALLS - calls),
      forgetting: enough ? forgettingByGap(tracks, inUse) : null,
      calibration: enough ? calibration(tracks, inUse) : null,
    }
  }).sort((a, b) => a.name.localeCompare(b.name) || a.userId.localeCompare(b.userId))
}
