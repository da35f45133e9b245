import { ResetRequestBody } from '#shared/schemas/auth'
import { mailResetLink } from '../../domain/password-resets'

// Always the same answer in the same time, so the route does not reveal which addresses have
// accounts (OWASP Authentication Cheat Sheet, "Authentication and Error Messages"): the lookup,
// the link and the mail happen after the answer.
export default defineEventHandler(async (event) => {
  const { email } = await readInput(event, ResetRequestBody)
  const base = appUrl()
  await spend('resetAddress', clientAddress(event))
  await spend('resetAccount', email)
  afterResponse(event, 'reset-request', () => mailResetLink(email, base))
  return { ok: true, message: 'If that address has an account, a link to set a new password is on its way.' }
})
