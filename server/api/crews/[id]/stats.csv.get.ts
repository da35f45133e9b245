import { stringify } from 'csv-stringify/sync'
import { IdParam } from '#shared/schemas/params'
import { StatsCsvQuery } from '#shared/schemas/stats'
import { requireCrewReports } from '../../../domain/policy'
import { crewStats, crewCsvColumns, crewStatsRecords } from '../../../domain/stats'

// The crew table as CSV (RFC 4180 quoting by csv-stringify), one header row of named columns with
// units, the numbers rounded as the table shows them and times in the reader's time zone (`tz`).
// A text cell that a spreadsheet would read as a formula (=, +, -, @, tab, CR first) gets a leading
// quote (OWASP "CSV Injection").
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewReports(event, id)
  const { tz, ...filters } = await queryInput(event, StatsCsvQuery)
  const timeZone = tz ?? 'UTC'
  const stats = crewStats(id, filters)
  const day = new Date(stats.generatedAt).toISOString().slice(0, 10)
  const file = `${stats.crew.name.replace(/[^\w-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || 'crew'}-stats-${day}.csv`
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${file}"`)
  // A byte order mark, so spreadsheet programs read the names' accents as UTF-8.
  return stringify(crewStatsRecords(stats, timeZone), {
    header: true,
    bom: true,
    escape_formulas: true,
    columns: crewCsvColumns(timeZone),
    cast: { number: v => String(v) },
  })
})
