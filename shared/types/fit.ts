// A crew's fitted scheduling parameters as the API returns them (GET /api/crews/[id]/fsrs).

export interface CalibrationBin {
  // mean predicted recall of the calls in the bin, share of them right, how many
  predicted: number
  observed: number
  count: number
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
}
