// The one way to raw SQL in the domain, for the few hot statements where the query builder's cost
// shows (the calls path, the crew table): a statement is prepared once per handle and SQL text
// (better-sqlite3 statements are reusable) and typed once by its caller, so rows need no cast.
// Everything else uses drizzle's query builder (useDb()).
// `.pluck()` and `.raw()` set a mode on the shared statement: a caller that uses one sets it every time.
import type { Database, Statement } from 'better-sqlite3'

const prepared = new WeakMap<Database, Map<string, Statement<unknown[], unknown>>>()

/** The prepared statement of this SQL on this handle. `Params` is a tuple of positional values, or `[{...}]` for named ones. */
export function statement<Row = unknown, Params extends unknown[] = unknown[]>(sqlite: Database, sql: string): Statement<Params, Row> {
  let byText = prepared.get(sqlite)
  if (!byText) prepared.set(sqlite, byText = new Map())
  let s = byText.get(sql)
  if (!s) byText.set(sql, s = sqlite.prepare(sql))
  return s as unknown as Statement<Params, Row>
}
