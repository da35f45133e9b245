// Password resets: a single-use link by mail, and the new password it sets.
import { and, eq, gt, isNull } from 'drizzle-orm'
import { findUserByEmail, nextSessionVersion } from './people'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'
import { hashToken, newId, newToken } from '../utils/ids'
import { linkMail, sendMail } from '../utils/mail'
import { assertGoodPassword } from '../utils/passwords'
// hashPassword is nuxt-auth-utils' (a Nitro auto-import: the module declares no importable path for it).

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

const LINK_GONE = 'This link has expired or was already used. Ask for a new one.'

/**
 * Sets a new password from a reset link: the link is claimed and the person's other unused links
 * die with it, in one transaction with the password; every old session ends. Answers the person.
 */
export async function resetPassword(tokenHash: string, password: string) {
  const db = useDb()
  const reset = db.select().from(tables.passwordResets).where(and(
    eq(tables.passwordResets.tokenHash, tokenHash),
    isNull(tables.passwordResets.usedAt),
    gt(tables.passwordResets.expiresAt, Date.now()),
  )).get()
  if (!reset) throw createError({ statusCode: 400, message: LINK_GONE })
  const user = db.select().from(tables.users).where(eq(tables.users.id, reset.userId)).get()
  if (!user || user.disabled) throw createError({ statusCode: 400, message: LINK_GONE })
  assertGoodPassword(password, user.email)
  const passwordHash = await hashPassword(password)
  const claimed = db.transaction((tx) => {
    const r = tx.update(tables.passwordResets).set({ usedAt: Date.now() })
      .where(and(eq(tables.passwordResets.id, reset.id), isNull(tables.passwordResets.usedAt))).run()
    if (r.changes !== 1) return false
    // A link still in a mailbox is a way in.
    tx.update(tables.passwordResets).set({ usedAt: Date.now() })
      .where(and(eq(tables.passwordResets.userId, user.id), isNull(tables.passwordResets.usedAt))).run()
    tx.update(tables.users).set({ passwordHash, sessionVersion: nextSessionVersion(), updatedAt: Date.now() })
      .where(eq(tables.users.id, user.id)).run()
    return true
  })
  if (!claimed) throw createError({ statusCode: 400, message: LINK_GONE })
  audit({ id: user.id, email: user.email, name: user.name, roles: [], crewIds: [] }, 'password.reset', 'user', user.id)
  return user
}
