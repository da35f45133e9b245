import { findUserByEmail } from './people'

export const RESET_TTL_MS = 60 * 60 * 1000

// Stores a single-use link for the account of `email`, if there is an enabled one, and mails it.
export async function mailResetLink(email: string, base: string) {
  const user = findUserByEmail(email)
  if (!user || user.disabled) return
  const token = newToken()
  useDb().insert(tables.passwordResets).values({
    id: newId(), tokenHash: hashToken(token), userId: user.id, expiresAt: Date.now() + RESET_TTL_MS,
  }).run()
  await sendMail(linkMail({
    to: user.email,
    subject: 'Set a new Glint password',
    lines: [`Hello ${user.name},`, 'Someone asked to set a new password for your Glint account. The link works once, for one hour. If it was not you, ignore this mail.'],
    link: `${base}/reset?token=${token}`,
    linkLabel: 'Set a new password',
  }))
}
