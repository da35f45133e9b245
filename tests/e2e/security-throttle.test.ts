// Sign-in throttling under concurrency (issue 14, item 5). NIST SP 800-63B §5.2.2: the verifier
// limits consecutive failed attempts on an account; a limit that reads the counter, checks the
// password and only then counts lets a concurrent burst through. OWASP Authentication Cheat Sheet,
// "Login Throttling": counted per account and per address pair, so one proxy's clients are not
// all locked out together. The per-address pair uses X-Forwarded-For only from trusted proxies
// (the e2e server trusts loopback, NUXT_TRUSTED_PROXIES=loopback).
import { afterAll, describe, expect, it } from 'vitest'
import { Client, crewIdOf, freshPerson } from '../support/client'
import { ownServer } from '../support/own-server'
import type { OwnServer } from '../support/own-server'

// TEST-NET addresses (RFC 5737), as a proxy would name its clients.
const ADDRESS_A = '198.51.100.7'
const ADDRESS_B = '203.0.113.9'

function login(email: string, password: string, forwardedFor?: string, base?: string) {
  const c = new Client(base)
  return c.req('POST', '/api/auth/login', { email, password }, forwardedFor ? { 'x-forwarded-for': forwardedFor } : {})
}

let own: OwnServer | undefined
afterAll(async () => {
  await own?.stop()
})

describe('sign-in throttling', () => {
  it('a concurrent burst of 45 wrong passwords checks at most 10, and the right one sent next is refused (429)', async () => {
    const p = await freshPerson('trainee', await crewIdOf('lead@glint.demo'))
    const wrong = Array.from({ length: 45 }, (_, i) => login(p.email, `wrong-${i}-password`, ADDRESS_A))
    // The right password goes out while the wrong ones are still being checked.
    await Promise.race(wrong)
    const right = await login(p.email, p.password, ADDRESS_A)
    const statuses = (await Promise.all(wrong)).map(r => r.status)
    // Design value: 10 failures per account and address in 15 minutes; only those reach the check.
    expect(statuses.filter(s => s === 401).length).toBeLessThanOrEqual(10)
    expect(statuses.filter(s => s !== 401 && s !== 429)).toEqual([])
    expect(right.status).toBe(429)
    expect(right.body.message).toMatch(/Try again in/)
  })

  it('a right password gives back only its own point: the failures before it still count', async () => {
    const p = await freshPerson('trainee', null)
    const statuses: number[] = []
    for (let i = 0; i < 9; i++) statuses.push((await login(p.email, `wrong-${i}-password`, ADDRESS_A)).status)
    statuses.push((await login(p.email, p.password, ADDRESS_A)).status)
    statuses.push((await login(p.email, 'wrong-tenth-password', ADDRESS_A)).status)
    statuses.push((await login(p.email, 'wrong-eleventh-password', ADDRESS_A)).status)
    expect(statuses).toEqual([...Array(9).fill(401), 200, 401, 429])
  })

  it('counts per account and address: behind a trusted proxy, another address still signs in', async () => {
    const p = await freshPerson('trainee', null)
    for (let i = 0; i < 10; i++) expect((await login(p.email, `wrong-${i}-password`, ADDRESS_A)).status).toBe(401)
    expect((await login(p.email, p.password, ADDRESS_A)).status).toBe(429)
    // The proxy appends the client's address to what the client sent: the nearest entry counts.
    expect((await login(p.email, p.password, `${ADDRESS_A}, ${ADDRESS_B}`)).status).toBe(200)
    expect((await login(p.email, p.password, ADDRESS_B)).status).toBe(200)
  })

  it('believes no X-Forwarded-For when no proxy is trusted (NUXT_TRUSTED_PROXIES unset)', async () => {
    own = await ownServer({ NUXT_TRUSTED_PROXIES: '' })
    const email = `xff-${Date.now().toString(36)}@glint.test`
    // Whatever X-Forwarded-For says, these come from one client (the socket's address).
    const statuses: number[] = []
    for (let i = 0; i < 11; i++) statuses.push((await login(email, `wrong-${i}-password`, `198.51.100.${i + 1}`, own.url)).status)
    expect(statuses).toEqual([...Array(10).fill(401), 429])
  })
})
