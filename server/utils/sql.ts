// The one way to raw SQL in the domain, for the few hot statements where the query builder's cost
// shows (the calls path, the crew table): a statement is prepared once per handle, SQL text and
// result shape (better-sqlite3 statements are reusable) and typed once by its caller, so rows need
// no cast. Everything else uses drizzle's query builder (useDb()).
// The shape is part of the cache key and fixed when the statement is prepared: better-sqlite3's
// `.pluck()` and `.raw()` change a statement for every later user, so two callers of one SQL text,
// one wanting rows and one a single value, would otherwise get each other's shape.
import type { Database, Statement } from 'better-sqlite3'

/** rows: objects by column name; pluck: the first column's value; raw: arrays of the columns. */
export type RowShape = 'rows' | 'pluck' | 'raw'

/** A prepared statement whose result shape is fixed (no pluck, raw or expand on it). */
export type FixedStatement<Params extends unknown[], Row> = Omit<Statement<Params, Row>, 'pluck' | 'raw' | 'expand'>

const prepared = new WeakMap<Database, Map<string, Statement<unknown[], unknown>>>()

/**
 * The prepared statement of this SQL on this handle, answering in the given shape. `Params` is a
 * tuple of positional values, or `[{...}]` for named ones; `Row` is what one result is in that shape.
 */
export function statement<Row = unknown, Params extends unknown[] = unknown[]>(sqlite: Database, sql: string, shape: RowShape = 'rows'): FixedStatement<Params, Row> {
  let byText = prepared.get(sqlite)
  if (!byText) prepared.set(sqlite, byText = new Map())
  const key = `${shape}\u0000${sql}`
  let s = byText.get(key)
  if (!s) {
    s = sqlite.prepare(sql)
    if (shape === 'pluck') s.pluck()
    else if (shape === 'raw') s.raw()
    byText.set(key, s)
  }
  return s as unknown as FixedStatement<Params, Row>
}
