import { createHash, randomBytes } from 'node:crypto'
import { nanoid } from 'nanoid'

// 126 random bits, URL-safe (nanoid's default alphabet): ids that cannot be guessed or
// enumerated. nanoid draws from a pool of random bytes refilled in bulk, where a randomBytes()
// call per id costs microseconds on a busy server (every call writes rows with new ids).
export function newId() {
  return nanoid()
}

// Single-use link tokens: 256 random bits; only their SHA-256 is stored.
export function newToken() {
  return randomBytes(32).toString('base64url')
}

export function hashToken(token: string) {
  return createHash('sha256').update(token).digest('hex')
}
