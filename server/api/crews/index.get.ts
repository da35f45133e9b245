import { listCrews } from '../../domain/crews'

// Admins see every crew; everyone else the crews they belong to.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return listCrews(actor)
})
