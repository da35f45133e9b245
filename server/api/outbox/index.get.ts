export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  if (mailTransportKind() !== 'outbox') {
    throw createError({ statusCode: 404, message: 'The local outbox is off: mail goes out through SMTP.' })
  }
  return outboxMails()
})
