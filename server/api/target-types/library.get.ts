// The instructor's library: the target types of all their own decks, to copy into another.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  return typeLibrary(actor)
})
