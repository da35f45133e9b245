import { desc } from 'drizzle-orm'
import { SAFETY_LINE, escapeHtml } from '../../shared/utils/mail-text'
import { createError } from 'h3'
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

const NO_PUBLIC_URL = 'This server cannot mail links yet: its administrator must set NUXT_PUBLIC_URL to the address people open Glint at.'

// The configured public address without a trailing slash, or null when unset or not an http(s) URL.
// The local outbox (mail transport "outbox"): the latest 200 mails stored, newest first, for an admin.
export function outboxMails() {
  const m = tables.mails
  return useDb().select({ id: m.id, to: m.to, subject: m.subject, text: m.text, html: m.html, status: m.status, error: m.error, sentAt: m.sentAt })
    .from(m).orderBy(desc(m.sentAt)).limit(200).all()
}

export function configuredPublicUrl(): string | null {
  const configured = String(useRuntimeConfig().publicUrl ?? '').trim()
  if (!configured) return null
  try {
    const url = new URL(configured)
    return url.protocol === 'https:' || url.protocol === 'http:' ? configured.replace(/\/+$/, '') : null
  }
  catch {
    return null
  }
}

// Links in mail come from configuration only, never from the request: its Host header is chosen
// by whoever sends it (OWASP Web Security Testing Guide, WSTG-INPV-17, host header injection).
// With none configured the mail is refused (503), except on the dev server.
export function appUrl(): string {
  const configured = configuredPublicUrl()
  if (configured) return configured
  if (import.meta.dev) return `http://localhost:${process.env.PORT || 3000}`
  throw createError({ statusCode: 503, message: NO_PUBLIC_URL })
}

export const publicUrlMissingMessage = `[glint] NUXT_PUBLIC_URL is not set (or not an http(s) address): invitations, password links and digests will not be mailed. Set it to the address people open Glint at, e.g. https://glint.example.org, and restart.`

// A plain mail with one link, in text and HTML.
export function linkMail(opts: { to: string, subject: string, lines: string[], link: string, linkLabel: string }): MailMessage {
  const text = [...opts.lines, '', `${opts.linkLabel}: ${opts.link}`, '', '—', SAFETY_LINE].join('\n')
  const html = `<div style="font-family:Nunito,system-ui,sans-serif;color:#0f2a3d;max-width:36rem">${
    opts.lines.map(l => `<p>${escapeHtml(l)}</p>`).join('')
  }<p><a href="${escapeHtml(opts.link)}" style="color:#9a4a00;font-weight:700">${escapeHtml(opts.linkLabel)}</a></p><p style="color:#6b8190;font-size:13px">${escapeHtml(SAFETY_LINE)}</p></div>`
  return { to: opts.to, subject: opts.subject, text, html }
}
