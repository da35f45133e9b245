import { createHash, randomBytes } from 'node:crypto'

// 128 random bits, URL-safe: ids that cannot be guessed or enumerated.
export function newId() {
  return randomBytes(16).toString('base64url')
}

// Single-use link tokens: 256 random bits; only their SHA-256 is stored.
export function newToken() {
  return randomBytes(32).toString('base64url')
}

export function hashToken(token: string) {
  return createHash('sha256').update(token).digest('hex')
}
