// Issue 17, items 1 to 3: an admin's people, crews, audit log and invitations; everyone's own name
// and password. Results are read from the database file, outside the routes that wrote them.
import { describe, expect, it } from 'vitest'
import { Client, linkFromOutbox, signedIn } from '../support/client'
import { TRAINEE_PASSWORD, directPerson, readDb } from '../support/watch-fixture'

const crewNamed = (name: string) => readDb(db => db.prepare('SELECT id FROM crews WHERE name = ?').pluck().get(name) as string)
const crewsOfUser = (userId: string) => readDb(db => (db.prepare('SELECT crew_id FROM memberships WHERE user_id = ? ORDER BY crew_id').pluck().all(userId) as string[]))
const auditRows = (action: string, userId: string) => readDb(db => db.prepare(`SELECT subject_id AS crewId, actor_id AS actorId FROM audit_log
  WHERE action = ? AND json_extract(detail, '$.userId') = ?`).all(action, userId) as { crewId: string, actorId: string }[])

describe('an admin places existing people in crews (item 1)', () => {
  it('adds a person to a crew, moves them to another, and each change is audited; a lead cannot', async () => {
    const admin = await signedIn('admin@glint.demo')
    const adminId = (await admin.get('/api/auth/me')).body.id
    const [skerrow, vellan] = [crewNamed('Skerrow Point Station'), crewNamed('Vellan Ness Station')]
    const p = await directPerson(['trainee'], null, false)

    const add = await admin.req('PUT', `/api/admin/users/${p.id}/crews`, { crewIds: [skerrow] })
    expect(add.status, add.text).toBe(200)
    expect(crewsOfUser(p.id)).toEqual([skerrow])
    const move = await admin.req('PUT', `/api/admin/users/${p.id}/crews`, { crewIds: [vellan] })
    expect(move.status).toBe(200)
    expect(crewsOfUser(p.id)).toEqual([vellan])
    // Design value: one audit row per join and per leave, naming the admin and the crew.
    expect(auditRows('crew.member.add', p.id).map(r => r.crewId).sort()).toEqual([skerrow, vellan].sort())
    expect(auditRows('crew.member.remove', p.id)).toEqual([{ crewId: skerrow, actorId: adminId }])

    // The people table shows the person's crews by name.
    const listed = await admin.get(`/api/admin/users?q=${encodeURIComponent(p.email)}`)
    expect(listed.headers.get('x-total-count')).toBe('1')
    expect(listed.body[0].crews).toEqual([{ id: vellan, name: 'Vellan Ness Station' }])

    // Issue 14's rule stays: a lead cannot pull a person into a crew; nothing changes.
    const lead = await signedIn('lead@glint.demo')
    const refused = await lead.req('PUT', `/api/admin/users/${p.id}/crews`, { crewIds: [skerrow, vellan] })
    expect(refused.status).toBe(403)
    expect(crewsOfUser(p.id)).toEqual([vellan])
    // A crew that does not exist: 404 with a sentence, no change.
    const unknown = await admin.req('PUT', `/api/admin/users/${p.id}/crews`, { crewIds: ['no-such-crew-0001'] })
    expect(unknown.status).toBe(404)
    expect(unknown.body.message).toMatch(/Reload the page/)
    expect(crewsOfUser(p.id)).toEqual([vellan])
  })

  it('searches and pages the people: the pages hold every match once, as many as the database has', async () => {
    const admin = await signedIn('admin@glint.demo')
    // The count is taken from the database with SQLite's own instr(), not the route's LIKE.
    const expected = readDb(db => db.prepare(`SELECT id FROM users WHERE instr(lower(email), 'glint.demo') > 0 OR instr(lower(name), 'glint.demo') > 0`).pluck().all() as string[])
    const seen: string[] = []
    for (let page = 1; page <= Math.ceil(expected.length / 4); page++) {
      const r = await admin.get(`/api/admin/users?q=GLINT.demo&page=${page}&size=4`)
      expect(r.status).toBe(200)
      expect(Number(r.headers.get('x-total-count'))).toBe(expected.length)
      expect(r.body.length).toBeLessThanOrEqual(4)
      seen.push(...r.body.map((u: { id: string }) => u.id))
    }
    expect(seen.sort()).toEqual([...expected].sort())
    // "%" is searched for as a character, not as a wildcard (SQLite LIKE ... ESCAPE).
    expect((await admin.get('/api/admin/users?q=%25')).headers.get('x-total-count')).toBe(String(readDb(db => db.prepare(`SELECT count(*) FROM users WHERE instr(name || email, '%') > 0`).pluck().get())))
    const bad = await admin.get('/api/admin/users?page=0')
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/Pages start at 1/)
  })

  it('searches and pages the audit log, and names the people and crews an entry points at', async () => {
    const admin = await signedIn('admin@glint.demo')
    const skerrow = crewNamed('Skerrow Point Station')
    const p = await directPerson(['trainee'], null, false)
    const name = readDb(db => db.prepare('SELECT name FROM users WHERE id = ?').pluck().get(p.id) as string)
    expect((await admin.req('PUT', `/api/admin/users/${p.id}/crews`, { crewIds: [skerrow] })).status).toBe(200)
    const r = await admin.get(`/api/admin/audit?q=${encodeURIComponent(name)}&action=crew.member.add`)
    expect(r.status).toBe(200)
    expect(r.headers.get('x-total-count')).toBe('1')
    expect(r.body[0].names).toMatchObject({ [p.id]: name, [skerrow]: 'Skerrow Point Station' })
    // Paging: two pages of 3 hold the 6 newest entries, in the database's order, none twice.
    const newest = readDb(db => db.prepare('SELECT id FROM audit_log ORDER BY created_at DESC, id LIMIT 6').pluck().all() as string[])
    const pages = [...(await admin.get('/api/admin/audit?size=3&page=1')).body, ...(await admin.get('/api/admin/audit?size=3&page=2')).body]
    expect(pages.map((e: { id: string }) => e.id)).toEqual(newest)
    const bad = await admin.get('/api/admin/audit?action=DROP%20TABLE')
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/letters, digits, dots and dashes/)
  })
})

describe('waiting invitations (item 2)', () => {
  it('a second invitation replaces the first link; resend and withdraw; each link says why it no longer works', async () => {
    const admin = await signedIn('admin@glint.demo')
    const email = `waiting-${Date.now().toString(36)}@glint.test`
    const preview = (token: string) => new Client().get(`/api/invites/preview?token=${token}`)
    expect((await admin.post('/api/invites', { email, role: 'trainee', crewId: null })).status).toBe(201)
    const first = (await linkFromOutbox(admin, email, '/invite'))!
    const second = await admin.post('/api/invites', { email, role: 'trainee', crewId: null })
    expect(second.body.replaced).toBe(1)
    const secondToken = (await linkFromOutbox(admin, email, '/invite'))!
    expect(secondToken).not.toBe(first)
    expect((await preview(first)).body.message).toMatch(/newer invitation/)
    expect((await preview(secondToken)).status).toBe(200)
    // Design value: one working link per address (the database holds one open invitation).
    expect(readDb(db => db.prepare('SELECT count(*) FROM invitations WHERE email = ? AND used_at IS NULL AND revoked_at IS NULL').pluck().get(email))).toBe(1)
    const listed = (await admin.get('/api/invites')).body.filter((i: { email: string }) => i.email === email)
    expect(listed).toHaveLength(1)

    const resent = await admin.post(`/api/invites/${listed[0].id}/resend`)
    expect(resent.status).toBe(201)
    const third = (await linkFromOutbox(admin, email, '/invite'))!
    expect((await preview(secondToken)).body.message).toMatch(/newer invitation/)
    expect((await admin.post(`/api/invites/${listed[0].id}/resend`)).status).toBe(409)

    expect((await admin.del(`/api/invites/${resent.body.id}`)).status).toBe(200)
    const withdrawn = await preview(third)
    expect(withdrawn.status).toBe(400)
    expect(withdrawn.body.message).toMatch(/withdrawn/)
    const accept = await new Client().post('/api/invites/accept', { token: third, name: 'Withdrawn Person', password: 'a long enough test phrase' })
    expect(accept.status).toBe(400)
    expect(readDb(db => db.prepare('SELECT count(*) FROM users WHERE email = ?').pluck().get(email))).toBe(0)
    const actions = readDb(db => db.prepare(`SELECT action FROM audit_log WHERE json_extract(detail, '$.email') = ? ORDER BY created_at`).pluck().all(email))
    expect(actions).toEqual(['invite.create', 'invite.create', 'invite.resend', 'invite.revoke'])
  })

  it('a used link says so before the form', async () => {
    const admin = await signedIn('admin@glint.demo')
    const email = `used-${Date.now().toString(36)}@glint.test`
    await admin.post('/api/invites', { email, role: 'trainee', crewId: null })
    const token = (await linkFromOutbox(admin, email, '/invite'))!
    expect((await new Client().post('/api/invites/accept', { token, name: 'Used Link', password: 'a long enough test phrase' })).status).toBe(201)
    const r = await new Client().get(`/api/invites/preview?token=${token}`)
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/already used to make an account/)
  })
})

describe('own name and password (item 3)', () => {
  it('changes the name; a password change ends the other sessions and keeps this one', async () => {
    const p = await directPerson(['trainee'], null)
    const other = await new Client().login(p.email, TRAINEE_PASSWORD)
    const renamed = await p.client.patch('/api/auth/me', { name: '  Mira Oldcastle ' })
    expect(renamed.body.name).toBe('Mira Oldcastle')
    expect(readDb(db => db.prepare('SELECT name FROM users WHERE id = ?').pluck().get(p.id))).toBe('Mira Oldcastle')

    const hashBefore = readDb(db => db.prepare('SELECT password_hash FROM users WHERE id = ?').pluck().get(p.id))
    const wrong = await p.client.post('/api/auth/password', { current: 'not my password', password: 'a brand new harbour phrase' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.message).toMatch(/current password/)
    // NIST SP 800-63B §5.1.1: a commonly used password is refused.
    expect((await p.client.post('/api/auth/password', { current: TRAINEE_PASSWORD, password: 'password1' })).status).toBe(400)
    expect(readDb(db => db.prepare('SELECT password_hash FROM users WHERE id = ?').pluck().get(p.id))).toBe(hashBefore)

    const ok = await p.client.post('/api/auth/password', { current: TRAINEE_PASSWORD, password: 'a brand new harbour phrase' })
    expect(ok.status).toBe(200)
    expect((await p.client.get('/api/auth/me')).status).toBe(200)
    expect((await other.get('/api/auth/me')).status).toBe(401)
    expect((await new Client().post('/api/auth/login', { email: p.email, password: TRAINEE_PASSWORD })).status).toBe(401)
    await new Client().login(p.email, 'a brand new harbour phrase')
  })
})
