// Tap baselines: a person's simple and choice reaction times, measured on their own device.
import { desc, eq } from 'drizzle-orm'
import type { BaselineInput } from '#shared/schemas/watch'
import type { TapBaseline } from '#shared/types/watch'
import { tables, useDb } from '../utils/db'
import { newId } from '../utils/ids'

export function saveTapBaseline(userId: string, input: BaselineInput): TapBaseline {
  const row = { id: newId(), userId, simpleMs: Math.round(input.simpleMs), choiceMs: Math.round(input.choiceMs), trials: input.trials, createdAt: Date.now() }
  useDb().insert(tables.tapBaselines).values(row).run()
  const { userId: _, ...out } = row
  return out
}

export function latestTapBaseline(userId: string): TapBaseline | null {
  const row = useDb().select().from(tables.tapBaselines).where(eq(tables.tapBaselines.userId, userId))
    .orderBy(desc(tables.tapBaselines.createdAt)).limit(1).get()
  if (!row) return null
  return { id: row.id, simpleMs: row.simpleMs, choiceMs: row.choiceMs, trials: row.trials, createdAt: row.createdAt }
}
