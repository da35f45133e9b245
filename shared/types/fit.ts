// A crew's fitted scheduling parameters as the API returns them (GET /api/crews/[id]/fsrs).

export interface CalibrationBin {
  // mean predicted recall of the calls in the bin, share of them right, how many
  predicted: number
  observed: number
  count: number
}

/** Calls after a track's first, grouped by whole days since the track's previous call. */
export interface ForgettingBin {
  // the bin's first and last gap in whole days (null: open-ended), the mean gap of its calls
  fromDays: number
  toDays: number | null
  meanDays: number
  // mean recall the crew's parameters in use predicted for these calls, share right, how many
  predicted: number
  observed: number
  count: number
}

/** One person of the crew: their calls against the parameters the crew uses, once there are enough. */
export interface PersonFitView {
  userId: string
  name: string
  // calls after a track's first (the ones a prediction is made for)
  calls: number
  // how many more are needed before the pictures are drawn (0: drawn)
  needed: number
  forgetting: ForgettingBin[] | null
  calibration: CalibrationBin[] | null
}

export interface CrewFitView {
  crewId: string
  status: 'idle' | 'running' | 'done' | 'too-few' | 'failed'
  progress: number
  message: string | null
  calls: number
  tracks: number
  needed: number
  minCalls: number
  defaults: { logLoss: number | null, rmse: number | null }
  fitted: { logLoss: number | null, rmse: number | null }
  adopted: boolean
  finishedAt: number | null
  // the forgetting curve after a first call graded sure: days, default and fitted recall
  curve: { days: number[], defaults: number[], fitted: number[] | null }
  calibration: { defaults: CalibrationBin[], fitted: CalibrationBin[] | null }
  // each person of the crew with calls on its decks, by name
  people: PersonFitView[]
}
