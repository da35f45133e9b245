// Links in mail and the reset and invitation flows (issue 14, items 6, 11 and 12).
// - Host header injection (OWASP Web Security Testing Guide, WSTG-INPV-17): a link mailed to a
//   person must never point where the request's Host header said.
// - Account enumeration through response time (OWASP WSTG-IDNT-04; OWASP Authentication Cheat
//   Sheet, "Authentication and Error Messages"): the reset request takes the same time either way.
// - A used reset link voids the person's other links (OWASP Forgot Password Cheat Sheet: tokens
//   are single use and invalidated once the password is reset).
import { request } from 'node:http'
import { median } from 'simple-statistics'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { Client, freshPerson, signedIn } from '../support/client'
import { ownServer } from '../support/own-server'
import type { OwnServer } from '../support/own-server'

const EVIL = 'evil.example'

// A POST with a Host header of the caller's choosing (fetch keeps the real one).
function postWithHost(base: string, path: string, body: unknown, host: string, cookie?: string) {
  const url = new URL(path, base)
  const payload = JSON.stringify(body)
  return new Promise<{ status: number, body: any }>((resolve, reject) => {
    const req = request({
      hostname: url.hostname, port: url.port, path: url.pathname, method: 'POST',
      headers: {
        'host': host, 'x-forwarded-host': host, 'content-type': 'application/json',
        'content-length': Buffer.byteLength(payload), ...(cookie ? { cookie } : {}),
      },
    }, (res) => {
      let text = ''
      res.on('data', (d: Buffer) => {
        text += d.toString()
      })
      res.on('end', () => resolve({ status: res.statusCode!, body: text ? JSON.parse(text) : null }))
    })
    req.on('error', reject)
    req.end(payload)
  })
}

interface Mail { to: string, text: string, html: string }

// The mails to an address with a link to `path`, newest first, once there are at least `count`
// (the reset mail is sent a moment after the answer).
async function mailsTo(admin: Client, to: string, path: string, count: number) {
  const until = Date.now() + 10_000
  for (;;) {
    const mails = (await admin.get<Mail[]>('/api/outbox')).body.filter(m => m.to === to && m.text.includes(`${path}?token=`))
    if (mails.length >= count || Date.now() > until) return mails
    await new Promise(r => setTimeout(r, 50))
  }
}

const tokenIn = (mail: Mail, path: string) => mail.text.match(new RegExp(`${path}\\?token=([\\w-]+)`))![1]!

let own: OwnServer | undefined
afterAll(async () => {
  await own?.stop()
})

describe('links in mail come from NUXT_PUBLIC_URL only', () => {
  it('a forged Host never reaches a reset or invitation link', async () => {
    const base = inject('baseUrl')
    const admin = await signedIn('admin@glint.demo')
    const p = await freshPerson('trainee', null)
    expect((await postWithHost(base, '/api/auth/reset-request', { email: p.email }, EVIL)).status).toBe(200)
    const invited = `host-${Date.now().toString(36)}@glint.test`
    const inv = await postWithHost(base, '/api/invites', { email: invited, role: 'trainee', crewId: null }, EVIL, admin.cookieHeader())
    expect(inv.status).toBe(201)
    for (const [to, path] of [[p.email, '/reset'], [invited, '/invite']] as const) {
      const [mail] = await mailsTo(admin, to, path, 1)
      expect(mail!.text).toContain(`${base}${path}?token=`)
      expect(mail!.text + mail!.html).not.toContain(EVIL)
    }
  })

  it('with NUXT_PUBLIC_URL unset: a clear message at start, and 503 with a sentence instead of a mail', async () => {
    own = await ownServer({ NUXT_PUBLIC_URL: '' })
    expect(own.log()).toMatch(/NUXT_PUBLIC_URL is not set/)
    const admin = await new Client(own.url).login('admin@glint.demo')
    const before = (await admin.get<Mail[]>('/api/outbox')).body.length
    const reset = await postWithHost(own.url, '/api/auth/reset-request', { email: 'trainee@glint.demo' }, EVIL)
    expect(reset.status).toBe(503)
    expect(reset.body.message).toMatch(/NUXT_PUBLIC_URL/)
    const inv = await postWithHost(own.url, '/api/invites', { email: `nourl-${Date.now().toString(36)}@glint.test`, role: 'trainee', crewId: null }, EVIL, admin.cookieHeader())
    expect(inv.status).toBe(503)
    expect(inv.body.message).toMatch(/NUXT_PUBLIC_URL/)
    await new Promise(r => setTimeout(r, 300))
    const after = (await admin.get<Mail[]>('/api/outbox')).body
    expect(after.length).toBe(before)
    expect(after.some(m => (m.text + m.html).includes(EVIL))).toBe(false)
  })
})

describe('reset links', () => {
  it('a used reset link voids the person\'s other unused links', async () => {
    const admin = await signedIn('admin@glint.demo')
    const p = await freshPerson('trainee', null)
    expect((await new Client().post('/api/auth/reset-request', { email: p.email })).status).toBe(200)
    await mailsTo(admin, p.email, '/reset', 1)
    expect((await new Client().post('/api/auth/reset-request', { email: p.email })).status).toBe(200)
    const [newer, older] = await mailsTo(admin, p.email, '/reset', 2)
    expect((await new Client().post('/api/auth/reset', { token: tokenIn(newer!, '/reset'), password: 'a quiet grey morning' })).status).toBe(200)
    const stale = await new Client().post('/api/auth/reset', { token: tokenIn(older!, '/reset'), password: 'another grey morning' })
    expect(stale.status).toBe(400)
    expect(stale.body.message).toMatch(/Ask for a new one/)
    await signedIn(p.email, 'a quiet grey morning')
  })

  it('takes the same time whether the account exists or not (medians of 30 each)', async () => {
    const base = inject('baseUrl')
    // Five requests an account an hour are allowed (design value): six people give 30 real ones.
    const people = await Promise.all(Array.from({ length: 6 }, () => freshPerson('trainee', null)))
    const stamp = Date.now().toString(36)
    const jobs = [
      ...people.flatMap(p => Array.from({ length: 5 }, () => ({ known: true, email: p.email }))),
      ...Array.from({ length: 30 }, (_, i) => ({ known: false, email: `nobody-${stamp}-${i}@glint.test` })),
    ]
    // Interleaved at random, so the machine's changing load falls on both alike.
    for (let i = jobs.length - 1; i > 0; i--) {
      const j = Math.floor(Math.random() * (i + 1))
      ;[jobs[i], jobs[j]] = [jobs[j]!, jobs[i]!]
    }
    const send = (email: string, n: number) => fetch(`${base}/api/auth/reset-request`, {
      method: 'POST',
      // One TEST-NET address a request (RFC 5737), so the per-address limit stays out of the way.
      headers: { 'content-type': 'application/json', 'origin': base, 'x-forwarded-for': `192.0.2.${(n % 250) + 1}` },
      body: JSON.stringify({ email }),
    })
    for (let i = 0; i < 5; i++) await (await send(`warm-${stamp}-${i}@glint.test`, 200 + i)).text()
    const known: number[] = []
    const unknown: number[] = []
    for (const [n, job] of jobs.entries()) {
      const t0 = performance.now()
      const r = await send(job.email, n)
      await r.text()
      const ms = performance.now() - t0
      expect(r.status).toBe(200)
      ;(job.known ? known : unknown).push(ms)
      // Room for the work done after the answer (it starts 150 ms later), so no request is timed under it.
      await new Promise(r => setTimeout(r, 350))
    }
    const ratio = median(known) / median(unknown)
    // Design value: within 1.5x either way (the issue measured 8-13 ms against 3.5-4 ms, over 2x).
    expect(ratio, `known ${median(known).toFixed(2)} ms, unknown ${median(unknown).toFixed(2)} ms`).toBeLessThan(1.5)
    expect(ratio).toBeGreaterThan(1 / 1.5)
  }, 120_000)
})

describe('invitations', () => {
  it('three invitations to one address accepted at the same moment: one account; the replaced links say a newer one was sent (issue 17, item 2)', async () => {
    const admin = await signedIn('admin@glint.demo')
    const email = `twice-${Date.now().toString(36)}@glint.test`
    for (let i = 0; i < 3; i++) expect((await admin.post('/api/invites', { email, role: 'trainee', crewId: null })).status).toBe(201)
    const tokens = (await mailsTo(admin, email, '/invite', 3)).map(m => tokenIn(m, '/invite'))
    const answers = await Promise.all(tokens.map(token => new Client().post('/api/invites/accept', { token, name: 'Twice Invited', password: 'a long enough test phrase' })))
    expect(answers.map(a => a.status).sort()).toEqual([201, 400, 400])
    for (const a of answers.filter(x => x.status === 400)) expect(a.body.message).toMatch(/newer invitation/)
    await signedIn(email, 'a long enough test phrase')
  })
})
