import { ResetBody } from '#shared/schemas/auth'
import { resetPassword } from '../../domain/password-resets'

export default defineEventHandler(async (event) => {
  const { token, password } = await readInput(event, ResetBody)
  const user = await resetPassword(hashToken(token), password)
  // A new password lifts the account's sign-in block, and the block of the address that set it.
  await forgive('loginAccount', user.email)
  await forgive('loginPair', `${user.email}|${clientAddress(event)}`)
  return { ok: true }
})
