import { createHash, randomBytes } from 'node:crypto'
import { nanoid } from 'nanoid'
import { v7 as uuidv7 } from 'uuid'

// 126 random bits, URL-safe (nanoid's default alphabet): ids that cannot be guessed or
// enumerated. nanoid draws from a pool of random bytes refilled in bulk, where a randomBytes()
// call per id costs microseconds on a busy server (every call writes rows with new ids).
export function newId() {
  return nanoid()
}

// A call's id: a UUIDv7 (RFC 9562), time-ordered, so each new call lands on the last page of the
// calls primary-key index instead of a random one, and a group commit writes one page fewer a call
// (7.5 WAL frames a call instead of 8.3 in a replay of 11,000 calls). Call ids are never shown nor
// used to reach anything; the time in one is when its row was written (for seeded history, the
// seeding), while the call's own times are its called_at and received_at columns.
// uuid draws its 16 random bytes with crypto.getRandomValues for each id (about 17 us a call in a
// profile of the calls benchmark); they come from a pool refilled in bulk instead, as nanoid does for
// newId(). Given its bytes, uuid fills the bits after the millisecond time with them and keeps no
// counter within a millisecond (RFC 9562 allows random bits there): still time-ordered to the millisecond.
const CALL_ID_POOL = 16 * 256
let callIdBytes = randomBytes(CALL_ID_POOL)
let callIdUsed = 0

export function newCallId() {
  if (callIdUsed + 16 > CALL_ID_POOL) {
    callIdBytes = randomBytes(CALL_ID_POOL)
    callIdUsed = 0
  }
  return uuidv7({ random: callIdBytes.subarray(callIdUsed, callIdUsed += 16) })
}

// Single-use link tokens: 256 random bits; only their SHA-256 is stored.
export function newToken() {
  return randomBytes(32).toString('base64url')
}

export function hashToken(token: string) {
  return createHash('sha256').update(token).digest('hex')
}
