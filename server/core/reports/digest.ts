// Content of the weekly digest to leads and the daily reminder to trainees, in text and HTML.
// Pure: the scheduled job gathers the numbers and hands the result to the mail transport.

import { SAFETY_LINE, escapeHtml } from '../../../shared/utils/mail-text'

export interface MailContent {
  subject: string
  text: string
  html: string
}

export interface DigestPerson {
  name: string
  readyNow: boolean
  readyWeekAgo: boolean
  accuracyNow: number | null
  accuracyWeekAgo: number | null
  lastCallAt: number | null
}

export interface WeeklyDigestInput {
  crewName: string
  people: readonly DigestPerson[]
  // the week is [weekStart, weekEnd), in ms since the epoch
  weekStart: number
  weekEnd: number
  // link to the crew table, when the mail should carry one
  crewUrl?: string
  // time zone the dates are written in; default UTC
  timeZone?: string
}

export interface WeeklyDigest extends MailContent {
  becameReady: string[]
  slipped: string[]
  notDrilled: string[]
  readyCount: number
}

// A name is one line: a stray line break must not reshape the mail or its subject.
function oneLine(s: string): string {
  return s.replace(/\s+/g, ' ').trim()
}

function formatDate(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone }).format(new Date(ms))
}

function pct(x: number | null): string {
  return x === null ? 'no calls' : `${Math.round(x * 100)}%`
}

function isHttpUrl(s: string): boolean {
  return /^https?:\/\//i.test(s)
}

const WRAP = 'font-family:Nunito,system-ui,sans-serif;color:#0f2a3d;max-width:36rem'
const FOOT = 'color:#6b8190;font-size:13px'
const LINK = 'color:#9a4a00;font-weight:700'

function htmlLink(url: string, label: string): string {
  return isHttpUrl(url) ? `<a href="${escapeHtml(url)}" style="${LINK}">${escapeHtml(label)}</a>` : escapeHtml(`${label}: ${url}`)
}

interface Section {
  title: string
  items: string[]
}

function byName(a: DigestPerson, b: DigestPerson): number {
  return a.name.localeCompare(b.name, 'en')
}

/**
 * The weekly digest for a crew's lead: who became ready (not ready a week ago, ready now), who
 * slipped (ready a week ago, not now) and who has not drilled this week (no call since weekStart).
 */
export function weeklyLeadDigest(input: WeeklyDigestInput): WeeklyDigest {
  const tz = input.timeZone ?? 'UTC'
  const crew = oneLine(input.crewName)
  const people = [...input.people].map(p => ({ ...p, name: oneLine(p.name) })).sort(byName)
  // weekEnd is exclusive: the last day shown is the one just before it.
  const range = `${formatDate(input.weekStart, tz)} to ${formatDate(input.weekEnd - 1, tz)}`

  const became = people.filter(p => p.readyNow && !p.readyWeekAgo)
  const slipped = people.filter(p => p.readyWeekAgo && !p.readyNow)
  const idle = people.filter(p => p.lastCallAt === null || p.lastCallAt < input.weekStart)
  const readyCount = people.filter(p => p.readyNow).length

  const sections: Section[] = [
    { title: 'Became ready', items: became.map(p => `${p.name} (accuracy ${pct(p.accuracyNow)})`) },
    { title: 'Slipped: ready a week ago, not ready now', items: slipped.map(p => `${p.name} (accuracy ${pct(p.accuracyNow)}, was ${pct(p.accuracyWeekAgo)})`) },
    {
      title: 'Not drilled this week',
      items: idle.map(p => `${p.name} (${p.lastCallAt === null ? 'no calls yet' : `last call ${formatDate(p.lastCallAt, tz)}`})`),
    },
  ]
  const intro = `${crew}, week of ${range}.`
  const summary = `Ready now: ${readyCount} of ${people.length}.`

  const text = [
    intro,
    summary,
    '',
    ...sections.flatMap(s => [`${s.title} (${s.items.length})`, ...(s.items.length ? s.items.map(i => `- ${i}`) : ['- none']), '']),
    ...(input.crewUrl ? [`Crew table: ${input.crewUrl}`, ''] : []),
    '—',
    SAFETY_LINE,
  ].join('\n')

  const html = `<div style="${WRAP}"><p>${escapeHtml(intro)}</p><p>${escapeHtml(summary)}</p>${
    sections.map(s => `<p><strong>${escapeHtml(s.title)} (${s.items.length})</strong></p>${
      s.items.length ? `<ul>${s.items.map(i => `<li>${escapeHtml(i)}</li>`).join('')}</ul>` : '<p>None.</p>'
    }`).join('')
  }${input.crewUrl ? `<p>${htmlLink(input.crewUrl, 'Open the crew table')}</p>` : ''}<p style="${FOOT}">${escapeHtml(SAFETY_LINE)}</p></div>`

  return {
    subject: `Glint weekly digest: ${crew}, ${range}`,
    text,
    html,
    becameReady: became.map(p => p.name),
    slipped: slipped.map(p => p.name),
    notDrilled: idle.map(p => p.name),
    readyCount,
  }
}

export interface DailyReminderInput {
  name: string
  tracksDue: number
  // link to today's watch
  appUrl: string
}

/** The opt-out daily reminder to a trainee with tracks due. */
export function dailyReminder(input: DailyReminderInput): MailContent {
  const name = oneLine(input.name)
  const n = Math.max(0, Math.floor(input.tracksDue))
  const due = n === 1 ? '1 track is' : `${n} tracks are`
  const lines = [
    `Hello ${name},`,
    `${due} due for today's watch. A few minutes now keeps them holding.`,
  ]
  const optOut = 'You get this reminder on days with tracks due; you can turn it off in your settings in Glint.'
  const text = [...lines, '', `Open today's watch: ${input.appUrl}`, '', optOut, '—', SAFETY_LINE].join('\n')
  const html = `<div style="${WRAP}">${lines.map(l => `<p>${escapeHtml(l)}</p>`).join('')}<p>${
    htmlLink(input.appUrl, 'Open today\'s watch')
  }</p><p style="${FOOT}">${escapeHtml(optOut)}</p><p style="${FOOT}">${escapeHtml(SAFETY_LINE)}</p></div>`
  return { subject: n === 1 ? 'Glint: 1 track due today' : `Glint: ${n} tracks due today`, text, html }
}
