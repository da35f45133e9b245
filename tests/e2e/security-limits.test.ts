// Rate limits (rate-limiter-flexible): password resets per account, invitations per sender.
import { describe, expect, it } from 'vitest'
import { Client, crewIdOf, freshPerson } from '../support/client'

describe('rate limits', () => {
  it('answers 429 to the sixth reset request for one account within the hour', async () => {
    const p = await freshPerson('trainee', null)
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) statuses.push((await new Client().post('/api/auth/reset-request', { email: p.email })).status)
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429])
    const r = await new Client().post('/api/auth/reset-request', { email: p.email })
    expect(r.status).toBe(429)
    expect(r.body.message).toMatch(/Try again in/)
  })

  it('answers 429 to the 61st invitation one lead sends within the hour', async () => {
    const crew = await crewIdOf('lead@glint.demo')
    const lead = await freshPerson('lead', crew)
    const stamp = Date.now().toString(36)
    const statuses: number[] = []
    for (let i = 0; i < 61; i++) {
      statuses.push((await lead.client.post('/api/invites', { email: `limit-${stamp}-${i}@glint.test`, role: 'trainee', crewId: crew })).status)
    }
    expect(statuses.slice(0, 60).every(s => s === 201)).toBe(true)
    expect(statuses[60]).toBe(429)
  })
})
