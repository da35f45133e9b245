import { SAFETY_LINE, escapeHtml } from '../../shared/utils/mail-text'
import nodemailer from 'nodemailer'
import type { Transporter } from 'nodemailer'

export interface MailMessage {
  to: string
  subject: string
  text: string
  html: string
}

let transporter: Transporter | undefined
let kind: 'smtp' | 'outbox' = 'outbox'

// The transport is chosen by configuration: an SMTP URL (NUXT_MAIL_URL), or, when unset,
// the local outbox: nodemailer builds the message and it is kept in the database only.
function transport() {
  if (!transporter) {
    const url = useRuntimeConfig().mailUrl
    kind = url ? 'smtp' : 'outbox'
    transporter = url ? nodemailer.createTransport(url) : nodemailer.createTransport({ jsonTransport: true })
  }
  return transporter
}

export function mailTransportKind() {
  transport()
  return kind
}

// Every mail is recorded, sent or not: a failed one keeps its error, nothing is lost silently.
export async function sendMail(message: MailMessage) {
  const t = transport()
  let status: 'sent' | 'failed' = 'sent'
  let error: string | null = null
  try {
    await t.sendMail({ from: useRuntimeConfig().mailFrom, ...message })
  }
  catch (e) {
    status = 'failed'
    error = e instanceof Error ? e.message : String(e)
    console.error(`[mail] sending to ${message.to} failed: ${error}`)
  }
  useDb().insert(tables.mails).values({ id: newId(), ...message, transport: kind, status, error }).run()
  return { status, error }
}

export function appUrl(event?: import('h3').H3Event) {
  const configured = useRuntimeConfig().publicUrl
  if (configured) return configured.replace(/\/$/, '')
  return event ? getRequestURL(event).origin : 'http://localhost:3000'
}

// A plain mail with one link, in text and HTML.
export function linkMail(opts: { to: string, subject: string, lines: string[], link: string, linkLabel: string }): MailMessage {
  const text = [...opts.lines, '', `${opts.linkLabel}: ${opts.link}`, '', '—', SAFETY_LINE].join('\n')
  const html = `<div style="font-family:Nunito,system-ui,sans-serif;color:#0f2a3d;max-width:36rem">${
    opts.lines.map(l => `<p>${escapeHtml(l)}</p>`).join('')
  }<p><a href="${escapeHtml(opts.link)}" style="color:#9a4a00;font-weight:700">${escapeHtml(opts.linkLabel)}</a></p><p style="color:#6b8190;font-size:13px">${escapeHtml(SAFETY_LINE)}</p></div>`
  return { to: opts.to, subject: opts.subject, text, html }
}
