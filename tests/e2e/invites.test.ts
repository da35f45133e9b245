import { describe, expect, it } from 'vitest'
import { Client, freshPerson, linkFromOutbox, signedIn } from '../support/client'

describe('invitations and resets', () => {
  it('a lead invites a trainee into own crew; common passwords are refused; the link works once', async () => {
    const lead = await signedIn('lead@glint.demo')
    const admin = await signedIn('admin@glint.demo')
    const crewId = (await lead.get('/api/auth/me')).body.crews[0].id
    const email = `new-${Date.now()}@glint.demo`
    const inv = await lead.post('/api/invites', { email, role: 'trainee', crewId })
    expect(inv.status).toBe(201)
    const token = await linkFromOutbox(admin, email, '/invite')
    // Link tokens are 256 random bits in base64url: 43 characters.
    expect(token).toMatch(/^[\w-]{43}$/)
    // NIST SP 800-63B §5.1.1: a password on a list of commonly used passwords is refused.
    const common = await new Client().post('/api/invites/accept', { token, name: 'Wren Haldane', password: 'password123' })
    expect(common.status).toBe(400)
    expect(common.body.message).toMatch(/common/i)
    // NIST SP 800-63B §5.1.1: fewer than 8 characters is refused.
    const short = await new Client().post('/api/invites/accept', { token, name: 'Wren Haldane', password: 'a1b2c3' })
    expect(short.status).toBe(400)
    const fresh = new Client()
    const ok = await fresh.post('/api/invites/accept', { token, name: 'Wren Haldane', password: 'tidewater lanterns at dusk' })
    expect(ok.status).toBe(201)
    const me = await fresh.get('/api/auth/me')
    expect(me.body.roles).toEqual(['trainee'])
    expect(me.body.crews.map((c: { id: string }) => c.id)).toEqual([crewId])
    const again = await new Client().post('/api/invites/accept', { token, name: 'Someone Else', password: 'another long phrase' })
    expect(again.status).toBe(400)
    // The new account signs in with its password.
    await signedIn(email, 'tidewater lanterns at dusk')
  })

  it('a trainee cannot invite; a lead cannot invite into another crew or as admin', async () => {
    const trainee = await signedIn('trainee@glint.demo')
    const lead = await signedIn('lead@glint.demo')
    const lead2 = await signedIn('lead2@glint.demo')
    const otherCrew = (await lead2.get('/api/auth/me')).body.crews[0].id
    const ownCrew = (await lead.get('/api/auth/me')).body.crews[0].id
    expect((await trainee.post('/api/invites', { email: 'x1@glint.demo', role: 'trainee', crewId: ownCrew })).status).toBe(403)
    expect((await lead.post('/api/invites', { email: 'x2@glint.demo', role: 'trainee', crewId: otherCrew })).status).toBe(403)
    expect((await lead.post('/api/invites', { email: 'x3@glint.demo', role: 'admin', crewId: ownCrew })).status).toBe(403)
  })

  it('a reset request for an unknown address answers 200 and sends nothing; a real one mails a single-use link', async () => {
    const admin = await signedIn('admin@glint.demo')
    const before = (await admin.get('/api/outbox')).body.length
    const unknown = await new Client().post('/api/auth/reset-request', { email: 'no-such-person@glint.demo' })
    expect(unknown.status).toBe(200)
    expect((await admin.get('/api/outbox')).body.length).toBe(before)
    const p = await freshPerson('trainee', null)
    const known = await new Client().post('/api/auth/reset-request', { email: p.email })
    expect(known.status).toBe(200)
    expect(known.body).toEqual(unknown.body)
    const token = await linkFromOutbox(admin, p.email, '/reset')
    // Link tokens are 256 random bits in base64url: 43 characters.
    expect(token).toMatch(/^[\w-]{43}$/)
    const old = p.client
    expect((await new Client().post('/api/auth/reset', { token, password: 'qwertyuiop' })).status).toBe(400)
    expect((await new Client().post('/api/auth/reset', { token, password: 'a quiet grey morning' })).status).toBe(200)
    expect((await new Client().post('/api/auth/reset', { token, password: 'a second grey morning' })).status).toBe(400)
    expect((await old.get('/api/auth/me')).status).toBe(401)
    await signedIn(p.email, 'a quiet grey morning')
  })

  it('only an admin reads the outbox', async () => {
    expect((await new Client().get('/api/outbox')).status).toBe(401)
    expect((await (await signedIn('trainee@glint.demo')).get('/api/outbox')).status).toBe(403)
    expect((await (await signedIn('lead@glint.demo')).get('/api/outbox')).status).toBe(403)
    const r = await (await signedIn('admin@glint.demo')).get('/api/outbox')
    expect(r.status).toBe(200)
    expect(Array.isArray(r.body)).toBe(true)
  })
})
