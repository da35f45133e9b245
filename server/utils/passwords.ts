import { dictionary } from '@zxcvbn-ts/language-common'

// NIST SP 800-63B §5.1.1: refuse passwords found on a list of commonly used passwords.
// The list is the maintained zxcvbn-ts common-password dictionary (about 49,000 entries).
const common = new Set((dictionary['passwords-common'] as string[]).map(p => p.toLowerCase()))

export function passwordProblem(password: string, email?: string): string | null {
  const p = password.toLowerCase()
  if (common.has(p)) return 'This password is on a list of commonly used passwords. Choose another.'
  if (email && p === email.toLowerCase()) return 'Do not use your e-mail address as the password.'
  if (/^(.)\1+$/.test(p)) return 'A password of one repeated character is too easy to guess.'
  return null
}

export function assertGoodPassword(password: string, email?: string) {
  const problem = passwordProblem(password, email)
  if (problem) throw createError({ statusCode: 400, message: problem, data: { field: 'password' } })
}
