export default defineEventHandler(() => {
  pingDatabase()
  return { status: 'ok' }
})
