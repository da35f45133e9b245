// npx tsx server/scripts/digests.ts [--weekly|--daily] [--now ISO]: sends the digests through the
// server's own mail code (SMTP from NUXT_MAIL_URL, else the outbox in the database). Each is sent once per period.
import { databasePath } from '../database/client'
import * as schema from '../database/schema'
import { DigestRunBody } from '../../shared/schemas/stats'

const args = process.argv.slice(2)
const at = args.indexOf('--now')
const parsed = DigestRunBody.safeParse({
  kind: args.includes('--daily') ? 'daily' : 'weekly',
  now: at >= 0 ? args[at + 1] : undefined,
})
if (!parsed.success || (args.includes('--daily') && args.includes('--weekly'))) {
  console.error('usage: npx tsx server/scripts/digests.ts [--weekly|--daily] [--now 2026-03-02T07:00:00Z]')
  process.exit(2)
}

// The server modules read Nitro's runtime config and auto-imports; outside Nitro the command
// provides the same few names, so the mail goes through the very same sendMail and outbox.
const config = {
  databasePath: databasePath(),
  mailUrl: process.env.NUXT_MAIL_URL || '',
  mailFrom: process.env.NUXT_MAIL_FROM || 'Glint <no-reply@glint.local>',
  publicUrl: process.env.NUXT_PUBLIC_URL || '',
}
// Digests carry a link to the app, built from NUXT_PUBLIC_URL only (as on the server).
if (!config.publicUrl) {
  console.error('NUXT_PUBLIC_URL is not set: digests carry a link to Glint and are not sent without it. Set it to the address people open Glint at.')
  process.exit(2)
}
const { useDb } = await import('../utils/db')
const { newId } = await import('../utils/ids')
Object.assign(globalThis, { useRuntimeConfig: () => config, useDb, tables: schema, newId })
const { runDigests } = await import('../domain/digests')

const { kind, now } = parsed.data
const result = await runDigests(kind, now ? Date.parse(now) : Date.now())
console.log(JSON.stringify(result))
process.exit(0)
