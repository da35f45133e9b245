// Issue 17, item 11: a lead's checks — who has not taken a check, a sign-off with a remark and the
// signer's name and time, and withdrawing a sign-off with a reason, audited. Results are read from
// the database file, outside the routes.
import { beforeAll, describe, expect, it } from 'vitest'
import { signedIn } from '../support/client'
import type { Client } from '../support/client'
import { drillTrainee, ensureWatchFixture, readDb } from '../support/watch-fixture'
import type { WatchFixture } from '../support/watch-fixture'
import type { CheckLists, CheckResult, CheckView } from '../../shared/schemas/checks'

let fx: WatchFixture
let instructor: Client
let lead: Client
let lead2: Client

const attemptRow = (id: string) => readDb(db => db.prepare(`SELECT signed_off_by, signed_off_at, sign_off_remark, withdrawn_by, withdraw_reason
  FROM check_attempts WHERE id = ?`).get(id) as Record<string, string | number | null>)
const auditOf = (action: string, id: string) => readDb(db => db.prepare('SELECT actor_id, detail FROM audit_log WHERE action = ? AND subject_id = ?').all(action, id) as { actor_id: string, detail: string }[])

async function finishedAttempt(checkId: string) {
  const t = await drillTrainee(fx.crewId)
  const issued = (await t.client.post(`/api/checks/${checkId}/attempts`)).body as { attemptId: string, sightings: { id: string, choices: { id: string }[] }[] }
  for (const s of issued.sightings) await t.client.post(`/api/sightings/${s.id}/call`, { choiceId: s.choices[0]!.id, latencyMs: 700, framesShown: 6, frameIntervalMs: 16.7 })
  return { trainee: t, attemptId: issued.attemptId }
}

beforeAll(async () => {
  fx = await ensureWatchFixture()
  instructor = await signedIn('instructor@glint.demo')
  lead = await signedIn('lead@glint.demo')
  lead2 = await signedIn('lead2@glint.demo')
}, 180_000)

describe('a lead\'s checks', () => {
  it('lists the crew\'s trainees who have not taken a check: the database\'s trainees minus those with an attempt that counts', async () => {
    const check = (await instructor.post<CheckView>('/api/checks', {
      deckId: fx.deckId, title: 'Not-taken list (test)', sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam', 'head-on'], passMark: 0.6,
    })).body
    const { trainee } = await finishedAttempt(check.id)
    const crew = (await lead.get<CheckLists>('/api/checks')).body.crews.find(c => c.crewId === fx.crewId)!
    const listed = crew.checks.find(c => c.id === check.id)!.notTaken.map(p => p.userId).sort()
    const expected = readDb(db => db.prepare(`SELECT m.user_id FROM memberships m JOIN user_roles r ON r.user_id = m.user_id AND r.role = 'trainee'
      JOIN users u ON u.id = m.user_id WHERE m.crew_id = ? AND u.disabled = 0`).pluck().all(fx.crewId) as string[]).filter(id => id !== trainee.id).sort()
    expect(listed).toEqual(expected)
    expect(listed).not.toContain(trainee.id)
  })

  it('signs off with a remark, shows who and when, and withdraws with a reason; both audited', async () => {
    const check = (await instructor.post<CheckView>('/api/checks', {
      deckId: fx.deckId, title: 'Sign-off remark (test)', sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.5,
    })).body
    const { attemptId } = await finishedAttempt(check.id)
    const leadMe = (await lead.get('/api/auth/me')).body
    const t0 = Date.now()
    const signed = await lead.post(`/api/checks/attempts/${attemptId}/sign-off`, { remark: '  Steady under haze. ' })
    expect(signed.status, signed.text).toBe(200)
    const row = attemptRow(attemptId)
    expect(row).toMatchObject({ signed_off_by: leadMe.id, sign_off_remark: 'Steady under haze.' })
    expect(row.signed_off_at as number).toBeGreaterThanOrEqual(t0 - 1000)
    const result = (await lead.get<CheckResult>(`/api/checks/attempts/${attemptId}`)).body
    expect(result.signedOff).toMatchObject({ name: leadMe.name, remark: 'Steady under haze.' })
    expect(JSON.parse(auditOf('check.sign-off', attemptId)[0]!.detail).remark).toBe('Steady under haze.')

    // Another crew's lead may not withdraw it; a missing reason is a 400 with a sentence; nothing changes.
    expect((await lead2.post(`/api/checks/attempts/${attemptId}/withdraw-sign-off`, { reason: 'Not mine to withdraw.' })).status).toBe(403)
    const noReason = await lead.post(`/api/checks/attempts/${attemptId}/withdraw-sign-off`, { reason: ' ' })
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/reason/)
    expect(attemptRow(attemptId).signed_off_by).toBe(leadMe.id)

    const w = await lead.post(`/api/checks/attempts/${attemptId}/withdraw-sign-off`, { reason: 'Signed off the wrong person.' })
    expect(w.status, w.text).toBe(200)
    expect(attemptRow(attemptId)).toMatchObject({ signed_off_by: null, signed_off_at: null, withdrawn_by: leadMe.id, withdraw_reason: 'Signed off the wrong person.' })
    const audited = auditOf('check.sign-off.withdraw', attemptId)
    expect(audited).toHaveLength(1)
    expect(audited[0]!.actor_id).toBe(leadMe.id)
    expect(JSON.parse(audited[0]!.detail)).toMatchObject({ reason: 'Signed off the wrong person.', signedOffBy: leadMe.id })
    expect((await lead.post(`/api/checks/attempts/${attemptId}/withdraw-sign-off`, { reason: 'Twice.' })).status).toBe(409)
    // It can be signed off again afterwards.
    expect((await lead.post(`/api/checks/attempts/${attemptId}/sign-off`, {})).status).toBe(200)
  })
})
