// What each assigned deck holds for today (due, new, an open watch), read only.
import { watchToday } from '../../domain/watches'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'trainee')
  return watchToday(actor.id)
})
