import type { H3Event } from 'h3'
import proxyaddr from 'proxy-addr'
import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible'

// Limits per account and per address (rate-limiter-flexible). Counters live in the one server process.
// Sign-in: 10 failures per account and address pair, 50 per account from anywhere, in 15 minutes
// (NIST SP 800-63B §5.2.2 allows at most 100 consecutive failures on one account).
// Drill results (scan passes, tap baselines): 60 a person in 10 minutes (design value).
const DRILL_RESULTS_LIMIT = { points: 60, duration: 10 * 60 }
const limiters = {
  loginPair: new RateLimiterMemory({ keyPrefix: 'login-pair', points: 10, duration: 15 * 60, blockDuration: 15 * 60 }),
  loginAccount: new RateLimiterMemory({ keyPrefix: 'login-acct', points: 50, duration: 15 * 60, blockDuration: 15 * 60 }),
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

let trust: ((addr: string, i: number) => boolean) | undefined

// NUXT_TRUSTED_PROXIES: addresses or CIDR ranges (comma or space separated) of the reverse proxies
// whose X-Forwarded-For is believed; none by default, so a client cannot name its own address.
function trustedProxies() {
  if (!trust) {
    const list = String(useRuntimeConfig().trustedProxies ?? '').split(/[\s,]+/).filter(Boolean)
    try {
      trust = proxyaddr.compile(list)
    }
    catch (e) {
      console.error(`[rate-limit] NUXT_TRUSTED_PROXIES is not a list of addresses or ranges (${(e as Error).message}); trusting no proxy.`)
      trust = proxyaddr.compile([])
    }
  }
  return trust
}

// The client's address: the socket's, or, behind a trusted proxy, the nearest X-Forwarded-For
// entry that no trusted proxy added (proxy-addr walks the list from the right).
export function clientAddress(event: H3Event) {
  try {
    return proxyaddr(event.node.req, trustedProxies()) || 'unknown'
  }
  catch {
    return 'unknown'
  }
}

function tooMany(res: RateLimiterRes, what = 'attempts') {
  const seconds = Math.max(1, Math.ceil(res.msBeforeNext / 1000))
  return createError({
    statusCode: 429,
    message: `Too many ${what}. Try again in ${seconds > 90 ? `${Math.ceil(seconds / 60)} minutes` : `${seconds} seconds`}.`,
    data: { retryAfter: seconds },
  })
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

// Spends a point under each key, all or none: when one refuses, the points already taken are given back.
export async function spendAll(...spends: [LimiterName, string][]) {
  const taken: [LimiterName, string][] = []
  try {
    for (const [name, key] of spends) {
      await spend(name, key)
      taken.push([name, key])
    }
  }
  catch (e) {
    for (const [name, key] of taken) await giveBack(name, key)
    throw e
  }
}

// Returns one point spent by `spend` (a request that turned out to be allowed).
export async function giveBack(name: LimiterName, key: string) {
  await limiters[name].reward(key, 1)
}

export async function forgive(name: LimiterName, key: string) {
  await limiters[name].delete(key)
}
