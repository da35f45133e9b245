import { ResetRequestBody } from '#shared/schemas/auth'

const RESET_TTL_MS = 60 * 60 * 1000

// Always the same answer, so the route does not reveal which addresses have accounts.
export default defineEventHandler(async (event) => {
  const { email } = await readInput(event, ResetRequestBody)
  await spend('resetAddress', clientAddress(event))
  await spend('resetAccount', email)
  const user = findUserByEmail(email)
  if (user && !user.disabled) {
    const token = newToken()
    useDb().insert(tables.passwordResets).values({
      id: newId(), tokenHash: hashToken(token), userId: user.id, expiresAt: Date.now() + RESET_TTL_MS,
    }).run()
    await sendMail(linkMail({
      to: user.email,
      subject: 'Set a new Glint password',
      lines: [`Hello ${user.name},`, 'Someone asked to set a new password for your Glint account. The link works once, for one hour. If it was not you, ignore this mail.'],
      link: `${appUrl(event)}/reset?token=${token}`,
      linkLabel: 'Set a new password',
    }))
  }
  return { ok: true, message: 'If that address has an account, a link to set a new password is on its way.' }
})
