import { desc } from 'drizzle-orm'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  if (mailTransportKind() !== 'outbox') {
    throw createError({ statusCode: 404, message: 'The local outbox is off: mail goes out through SMTP.' })
  }
  return useDb().select({
    id: tables.mails.id, to: tables.mails.to, subject: tables.mails.subject, text: tables.mails.text, html: tables.mails.html,
    status: tables.mails.status, error: tables.mails.error, sentAt: tables.mails.sentAt,
  }).from(tables.mails).orderBy(desc(tables.mails.sentAt)).limit(200).all()
})
