import { describe, expect, it } from 'vitest'
import { auditDetailFields } from '../../shared/utils/audit-detail'

// Issue 17, item 1: "the audit detail is shown as readable fields, not raw JSON". Expected texts are
// written by hand (design value); the date is checked against the IANA tz database (Europe/Lisbon
// is UTC+0 in December, so 2026-12-02T10:05Z reads 10:05).
describe('audit detail as readable fields', () => {
  it('names ids, words booleans, lists arrays and writes shares as percent', () => {
    const fields = auditDetailFields(
      { userId: 'u1', crewIds: ['c1', 'c2'], disabled: true, score: 0.8, roles: ['trainee', 'lead'], hesitationMs: 900 },
      { u1: 'Mira Oldcastle', c1: 'Skerrow Point Station', c2: 'Vellan Ness Station' },
    )
    expect(fields).toEqual([
      { label: 'Person', value: 'Mira Oldcastle' },
      { label: 'Crews', value: 'Skerrow Point Station, Vellan Ness Station' },
      { label: 'Account disabled', value: 'yes' },
      { label: 'Score', value: '80 %' },
      { label: 'Roles', value: 'trainee, lead' },
      { label: 'Hesitation ms', value: '900' },
    ])
  })

  it('writes times in the given zone and keeps an unknown id as it is', () => {
    const fields = auditDetailFields({ signedOffAt: Date.UTC(2026, 11, 2, 10, 5), userId: 'gone' }, {}, 'Europe/Lisbon')
    expect(fields[0]).toEqual({ label: 'Signed off at', value: '2 Dec 2026, 10:05' })
    expect(fields[1]).toEqual({ label: 'Person', value: 'gone' })
    expect(auditDetailFields(null)).toEqual([])
  })
})
