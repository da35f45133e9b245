import { and, eq, gt, isNull, sql } from 'drizzle-orm'
import { ResetBody } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { token, password } = await readInput(event, ResetBody)
  const db = useDb()
  const reset = db.select().from(tables.passwordResets).where(and(
    eq(tables.passwordResets.tokenHash, hashToken(token)),
    isNull(tables.passwordResets.usedAt),
    gt(tables.passwordResets.expiresAt, Date.now()),
  )).get()
  if (!reset) throw createError({ statusCode: 400, message: 'This link has expired or was already used. Ask for a new one.' })
  const user = db.select().from(tables.users).where(eq(tables.users.id, reset.userId)).get()
  if (!user || user.disabled) throw createError({ statusCode: 400, message: 'This link has expired or was already used. Ask for a new one.' })
  assertGoodPassword(password, user.email)
  const passwordHash = await hashPassword(password)
  // Claim the link and set the password in one transaction; old sessions end with the version bump.
  const claimed = db.transaction((tx) => {
    const r = tx.update(tables.passwordResets).set({ usedAt: Date.now() })
      .where(and(eq(tables.passwordResets.id, reset.id), isNull(tables.passwordResets.usedAt))).run()
    if (r.changes !== 1) return false
    // The person's other unused links die with this one: a link still in a mailbox is a way in.
    tx.update(tables.passwordResets).set({ usedAt: Date.now() })
      .where(and(eq(tables.passwordResets.userId, user.id), isNull(tables.passwordResets.usedAt))).run()
    tx.update(tables.users).set({ passwordHash, sessionVersion: sql`${tables.users.sessionVersion} + 1`, updatedAt: Date.now() })
      .where(eq(tables.users.id, user.id)).run()
    return true
  })
  if (!claimed) throw createError({ statusCode: 400, message: 'This link has expired or was already used. Ask for a new one.' })
  audit({ id: user.id, email: user.email, name: user.name, roles: [], crewIds: [] }, 'password.reset', 'user', user.id)
  // A new password lifts the account's sign-in block, and the block of the address that set it.
  await forgive('loginAccount', user.email)
  await forgive('loginPair', `${user.email}|${clientAddress(event)}`)
  return { ok: true }
})
