import { stringify } from 'csv-stringify/sync'
import { IdParam } from '#shared/schemas/params'
import { StatsQuery } from '#shared/schemas/stats'

// The crew table as CSV (RFC 4180 quoting by csv-stringify), one header row, numbers unformatted.
// A text cell that a spreadsheet would read as a formula (=, +, -, @, tab, CR first) gets a leading
// quote (OWASP "CSV Injection"); negative numbers stay numbers.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const sqlite = useSqlite()
  await requireCrewStatsAccess(event, sqlite, id)
  const filters = await queryInput(event, StatsQuery)
  const stats = crewStatsOf(sqlite, id, filters, Date.now())
  const day = new Date(stats.generatedAt).toISOString().slice(0, 10)
  const file = `${stats.crew.name.replace(/[^\w-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || 'crew'}-stats-${day}.csv`
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${file}"`)
  return stringify(crewStatsRecords(stats), {
    header: true,
    escape_formulas: true,
    columns: [...CREW_CSV_COLUMNS],
    cast: { boolean: v => (v ? 'true' : 'false'), number: v => String(v) },
  })
})
