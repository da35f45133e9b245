import { describe, expect, it } from 'vitest'
import { dailyReminder, weeklyLeadDigest } from '../../../server/core/reports/digest'

// The digest's content is defined by issue 5 (who became ready, who slipped, who has not
// drilled); the closing line is product.md's safety note. Names are invented.
const WEEK_START = Date.UTC(2025, 2, 3) // Monday 3 March 2025
const WEEK_END = Date.UTC(2025, 2, 10)
const DAY = 86_400_000

const people = [
  { name: 'Ada Quill', readyNow: true, readyWeekAgo: false, accuracyNow: 0.93, accuracyWeekAgo: 0.88, lastCallAt: WEEK_START + 2 * DAY },
  { name: 'Bram Osk', readyNow: true, readyWeekAgo: true, accuracyNow: 0.97, accuracyWeekAgo: 0.96, lastCallAt: WEEK_START + 5 * DAY },
  { name: 'Cora Venn', readyNow: false, readyWeekAgo: true, accuracyNow: 0.84, accuracyWeekAgo: 0.92, lastCallAt: WEEK_START + DAY },
  { name: 'Dov <b>Tern</b> & Co', readyNow: false, readyWeekAgo: false, accuracyNow: 0.7, accuracyWeekAgo: 0.71, lastCallAt: WEEK_START - 1 },
  { name: 'Eli Marsh', readyNow: false, readyWeekAgo: false, accuracyNow: null, accuracyWeekAgo: null, lastCallAt: null },
]

describe('weeklyLeadDigest for a known week', () => {
  const d = weeklyLeadDigest({ crewName: 'Harbour Watch Two', people, weekStart: WEEK_START, weekEnd: WEEK_END })

  it('finds who became ready, who slipped and who did not drill', () => {
    expect(d.becameReady).toEqual(['Ada Quill'])
    expect(d.slipped).toEqual(['Cora Venn'])
    // a last call one millisecond before the week began is not this week
    expect(d.notDrilled).toEqual(['Dov <b>Tern</b> & Co', 'Eli Marsh'])
    expect(d.readyCount).toBe(2)
  })

  it('writes the week and the lists in the text', () => {
    expect(d.subject).toBe('Glint weekly digest: Harbour Watch Two, 3 March 2025 to 9 March 2025')
    expect(d.text).toContain('Ready now: 2 of 5.')
    expect(d.text).toContain('Became ready (1)\n- Ada Quill (accuracy 93%)')
    expect(d.text).toContain('- Cora Venn (accuracy 84%, was 92%)')
    expect(d.text).toContain('Not drilled this week (2)\n- Dov <b>Tern</b> & Co (last call 2 March 2025)\n- Eli Marsh (no calls yet)')
    expect(d.text).not.toContain('Bram Osk')
  })

  it('escapes names in the HTML', () => {
    expect(d.html).toContain('Dov &lt;b&gt;Tern&lt;/b&gt; &amp; Co')
    expect(d.html).not.toContain('<b>Tern')
  })

  it('ends both parts with the safety line', () => {
    expect(d.text.trimEnd().endsWith('Glint is a training aid: it replaces neither qualified instruction nor your unit\'s own rules for standing a look-out watch.')).toBe(true)
    expect(d.text).toContain('Never look at or near the sun')
    expect(d.html).toContain('Never look at or near the sun')
  })

  it('says "none" for an empty list, and keeps a name with a line break on one line', () => {
    const quiet = weeklyLeadDigest({
      crewName: 'Pier\nCrew',
      people: [{ ...people[1]!, name: 'Bram\r\nOsk' }],
      weekStart: WEEK_START,
      weekEnd: WEEK_END,
    })
    expect(quiet.subject).not.toMatch(/[\r\n]/)
    expect(quiet.text).toContain('Became ready (0)\n- none')
    expect(quiet.html).toContain('None.')
  })
})

describe('dailyReminder', () => {
  it('tells the trainee how many tracks are due and links the watch', () => {
    const m = dailyReminder({ name: 'Ada <Quill>', tracksDue: 12, appUrl: 'https://glint.example/watch' })
    expect(m.subject).toBe('Glint: 12 tracks due today')
    expect(m.text).toContain('Hello Ada <Quill>,')
    expect(m.text).toContain('12 tracks are due for today\'s watch.')
    expect(m.text).toContain('https://glint.example/watch')
    expect(m.html).toContain('Ada &lt;Quill&gt;')
    expect(m.html).toContain('href="https://glint.example/watch"')
    expect(m.text).toContain('Never look at or near the sun')
    expect(m.html).toContain('Never look at or near the sun')
    expect(dailyReminder({ name: 'Ada', tracksDue: 1, appUrl: 'https://glint.example/watch' }).subject).toBe('Glint: 1 track due today')
  })

  it('never puts a non-web link in an href', () => {
    const m = dailyReminder({ name: 'Ada', tracksDue: 2, appUrl: 'javascript:alert(1)' })
    expect(m.html).not.toContain('href=')
  })
})
