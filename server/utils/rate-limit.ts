import type { H3Event } from 'h3'
import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible'

// Limits per account and per address (rate-limiter-flexible). Counters live in the one server process.
// Drill results (scan passes, tap baselines): 60 a person in 10 minutes (design value).
const DRILL_RESULTS_LIMIT = { points: 60, duration: 10 * 60 }
const limiters = {
  loginAccount: new RateLimiterMemory({ keyPrefix: 'login-acct', points: 10, duration: 15 * 60, blockDuration: 15 * 60 }),
  loginAddress: new RateLimiterMemory({ keyPrefix: 'login-addr', points: 50, duration: 15 * 60, blockDuration: 15 * 60 }),
  resetAccount: new RateLimiterMemory({ keyPrefix: 'reset-acct', points: 5, duration: 60 * 60 }),
  resetAddress: new RateLimiterMemory({ keyPrefix: 'reset-addr', points: 30, duration: 60 * 60 }),
  inviteAccount: new RateLimiterMemory({ keyPrefix: 'invite-acct', points: 60, duration: 60 * 60 }),
  uploadAccount: new RateLimiterMemory({ keyPrefix: 'upload-acct', points: 300, duration: 60 * 60 }),
  // Drill results a person sends: a scan pass is started and sent (2 points) and takes at least
  // 30 s, so 20 passes in 10 minutes is the most a person can make; a tap baseline takes longer.
  scanAccount: new RateLimiterMemory({ keyPrefix: 'scan-acct', ...DRILL_RESULTS_LIMIT }),
  baselineAccount: new RateLimiterMemory({ keyPrefix: 'baseline-acct', ...DRILL_RESULTS_LIMIT }),
}
export type LimiterName = keyof typeof limiters

export function clientAddress(event: H3Event) {
  return getRequestIP(event, { xForwardedFor: false }) || 'unknown'
}

function tooMany(res: RateLimiterRes, what = 'attempts') {
  const seconds = Math.max(1, Math.ceil(res.msBeforeNext / 1000))
  return createError({
    statusCode: 429,
    message: `Too many ${what}. Try again in ${seconds > 90 ? `${Math.ceil(seconds / 60)} minutes` : `${seconds} seconds`}.`,
    data: { retryAfter: seconds },
  })
}

// Refuses with 429 while the key is blocked, without spending a point.
export async function assertNotLimited(name: LimiterName, key: string) {
  const res = await limiters[name].get(key)
  if (res && res.consumedPoints >= limiters[name].points) throw tooMany(res)
}

// Spends a point; refuses with 429 once the limit is passed ("Too many <what>. Try again in ...").
export async function spend(name: LimiterName, key: string, what?: string) {
  try {
    await limiters[name].consume(key)
  }
  catch (e) {
    if (e instanceof RateLimiterRes) throw tooMany(e, what)
    throw e
  }
}

export async function forgive(name: LimiterName, key: string) {
  await limiters[name].delete(key)
}
