import { describe, expect, it } from 'vitest'
import { DEMO_PEOPLE } from '../../server/seed/people'
import { Client, crewIdOf, freshPerson, signedIn } from '../support/client'

describe('sign-in', () => {
  it('signs in every demo account and /api/auth/me shows its roles and crews (api.md contract)', async () => {
    for (const p of DEMO_PEOPLE) {
      const c = await signedIn(p.email)
      const me = await c.get('/api/auth/me')
      expect(me.status).toBe(200)
      expect(me.body.email).toBe(p.email)
      expect([...me.body.roles].sort()).toEqual([...p.roles].sort())
      expect(me.body.crews).toHaveLength(p.crews.length)
      for (const crew of me.body.crews) expect(crew).toEqual({ id: expect.any(String), name: expect.any(String) })
    }
  })

  it('answers 401 with one message for an unknown address and for a wrong password', async () => {
    const unknown = await new Client().post('/api/auth/login', { email: 'nobody@glint.demo', password: 'whatever-it-is' })
    const wrong = await new Client().post('/api/auth/login', { email: 'trainee2@glint.demo', password: 'not-the-password' })
    expect(unknown.status).toBe(401)
    expect(wrong.status).toBe(401)
    expect(unknown.body.message).toBe(wrong.body.message)
  })

  it('answers 400 with a message for malformed JSON, wrong types and missing fields', async () => {
    const c = new Client()
    const bad = await c.req('POST', '/api/auth/login', '{"email": "lead@glint.demo", ', { 'content-type': 'application/json' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/json/i)
    const types = await c.post('/api/auth/login', { email: 42, password: ['x'] })
    expect(types.status).toBe(400)
    expect(types.body.message).toMatch(/email/)
    const missing = await c.post('/api/auth/login', {})
    expect(missing.status).toBe(400)
    const extra = await c.post('/api/auth/login', { email: 'a@b.c', password: 'x', $where: '1' })
    expect(extra.status).toBe(400)
  })

  it('throttles repeated wrong passwords for one account with 429 before 40 tries', async () => {
    const p = await freshPerson('trainee', await crewIdOf('lead@glint.demo'))
    const statuses: number[] = []
    for (let i = 0; i < 40; i++) {
      const r = await new Client().post('/api/auth/login', { email: p.email, password: `wrong-${i}-password` })
      statuses.push(r.status)
    }
    const first429 = statuses.indexOf(429)
    expect(first429).toBeGreaterThan(0)
    expect(first429).toBeLessThan(40)
    expect(statuses.slice(0, first429).every(s => s === 401)).toBe(true)
    // The right password is refused too while the account is blocked.
    const right = await new Client().post('/api/auth/login', { email: p.email, password: p.password })
    expect(right.status).toBe(429)
  })

  it('makes every copy of a cookie useless after sign-out', async () => {
    const p = await freshPerson('trainee', null)
    const c = p.client
    const copy = new Client()
    copy.cookies = new Map(c.cookies)
    expect((await copy.get('/api/auth/me')).status).toBe(200)
    expect((await c.post('/api/auth/logout')).status).toBe(200)
    expect((await copy.get('/api/auth/me')).status).toBe(401)
    // A fresh sign-in works again.
    await c.login(p.email, p.password)
    expect((await c.get('/api/auth/me')).status).toBe(200)
  })

  it('refuses the old cookie of a disabled account, and a role change takes effect on the next request', async () => {
    const admin = await signedIn('admin@glint.demo')
    const p = await freshPerson('trainee', null)
    const t4 = { id: p.id }
    const c = p.client
    expect((await c.get('/api/outbox')).status).toBe(403)
    expect((await admin.patch(`/api/admin/users/${t4.id}`, { roles: ['trainee', 'admin'] })).status).toBe(200)
    expect((await c.get('/api/outbox')).status).toBe(200)
    expect((await admin.patch(`/api/admin/users/${t4.id}`, { roles: ['trainee'] })).status).toBe(200)
    expect((await c.get('/api/outbox')).status).toBe(403)
    expect((await admin.patch(`/api/admin/users/${t4.id}`, { disabled: true })).status).toBe(200)
    expect((await c.get('/api/auth/me')).status).toBe(401)
    expect((await new Client().post('/api/auth/login', { email: p.email, password: p.password })).status).toBe(401)
    expect((await admin.patch(`/api/admin/users/${t4.id}`, { disabled: false })).status).toBe(200)
    await c.login(p.email, p.password)
    const audit = await admin.get('/api/admin/audit')
    expect(audit.body.some((a: { action: string, subjectId: string }) => a.action === 'user.update' && a.subjectId === t4.id)).toBe(true)
  })

  it('sets an HttpOnly, SameSite session cookie with a lifetime', async () => {
    const r = await new Client().post('/api/auth/login', { email: 'trainee5@glint.demo', password: 'harbour-lantern-42' })
    const cookie = r.headers.getSetCookie().join('\n')
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).toMatch(/Max-Age=\d+|Expires=/i)
  })
})
