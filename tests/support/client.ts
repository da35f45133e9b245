// A small HTTP client with a cookie jar, for signed-in requests against the built server.
import { inject } from 'vitest'

export const DEMO_PASSWORD = 'harbour-lantern-42'

export interface Res<T = any> { status: number, body: T, headers: Headers, text: string }

export class Client {
  cookies = new Map<string, string>()
  constructor(public base = inject('baseUrl')) {}

  cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }

  async req<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Res<T>> {
    const h: Record<string, string> = { origin: this.base, ...headers }
    if (this.cookies.size) h.cookie = this.cookieHeader()
    let payload: BodyInit | undefined
    if (typeof body === 'string' || body instanceof Uint8Array || body instanceof FormData) payload = body as BodyInit
    else if (body !== undefined) {
      payload = JSON.stringify(body)
      h['content-type'] ??= 'application/json'
    }
    const r = await fetch(this.base + path, { method, headers: h, body: payload, redirect: 'manual' })
    for (const c of r.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      const name = pair!.slice(0, i)
      const value = pair!.slice(i + 1)
      if (!value || /max-age=0|expires=thu, 01 jan 1970/i.test(c)) this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
    const text = await r.text()
    let parsed: unknown = text
    try {
      parsed = JSON.parse(text)
    }
    catch { /* not JSON */ }
    return { status: r.status, body: parsed as T, headers: r.headers, text }
  }

  get<T = any>(path: string) { return this.req<T>('GET', path) }
  post<T = any>(path: string, body?: unknown) { return this.req<T>('POST', path, body ?? {}) }
  patch<T = any>(path: string, body?: unknown) { return this.req<T>('PATCH', path, body ?? {}) }
  del<T = any>(path: string) { return this.req<T>('DELETE', path) }

  async login(email: string, password = DEMO_PASSWORD) {
    const r = await this.post('/api/auth/login', { email, password })
    if (r.status !== 200) throw new Error(`login ${email}: ${r.status} ${r.text}`)
    return this
  }
}

export const signedIn = (email: string, password?: string) => new Client().login(email, password)

// The link in the newest outbox mail to an address that carries one to `path`, read as the admin.
// Reset mails are sent a moment after the answer (server/utils/after-response.ts), so the outbox
// is read again for a while.
export async function linkFromOutbox(admin: Client, to: string, path: string) {
  const until = Date.now() + 10_000
  for (;;) {
    const r = await admin.get<{ to: string, text: string }[]>('/api/outbox')
    const link = new RegExp(`https?://\\S+${path}\\?token=([\\w-]+)`)
    const m = r.body.find(mail => mail.to === to && link.test(mail.text))?.text.match(link)
    if (m) return m[1]!
    if (Date.now() > until) return null
    await new Promise(resolve => setTimeout(resolve, 50))
  }
}

let freshCount = 0
// Names unique to this module's load: test files can share one process, each with its own count.
const LOAD = Math.random().toString(36).slice(2, 8)
let deputy: Promise<Client> | null = null

// An admin of this test file's own, invited once by the demo admin: each sender may send 60
// invitations an hour (server/utils/rate-limit.ts), and a whole suite makes more people than that.
function inviter(): Promise<Client> {
  deputy ??= (async () => {
    const admin = await signedIn('admin@glint.demo')
    const email = `d${Date.now().toString(36)}-${process.pid}-admin@glint.test`
    const inv = await admin.post('/api/invites', { email, role: 'admin', crewId: null })
    if (inv.status !== 201) throw new Error(`invite: ${inv.status} ${inv.text}`)
    const token = await linkFromOutbox(admin, email, '/invite')
    const c = new Client()
    const r = await c.post('/api/invites/accept', { token, name: `Test admin ${process.pid}`, password: 'a long enough test phrase' })
    if (r.status !== 201) throw new Error(`accept: ${r.status} ${r.text}`)
    return c
  })()
  return deputy
}

// A new person made through the real invitation flow (an admin invites, the link is accepted),
// so tests that change or lock an account never spoil the shared demo accounts.
export async function freshPerson(role: 'trainee' | 'instructor' | 'lead' | 'admin', crewId: string | null, password = 'a long enough test phrase') {
  const admin = await inviter()
  const email = `t${Date.now().toString(36)}-${++freshCount}-${role}@glint.test`
  const inv = await admin.post('/api/invites', { email, role, crewId })
  if (inv.status !== 201) throw new Error(`invite: ${inv.status} ${inv.text}`)
  const token = await linkFromOutbox(admin, email, '/invite')
  const c = new Client()
  const r = await c.post('/api/invites/accept', { token, name: `Test ${role} ${LOAD}-${String(freshCount).padStart(4, '0')}`, password })
  if (r.status !== 201) throw new Error(`accept: ${r.status} ${r.text}`)
  return { client: c, email, password, id: r.body.id as string }
}

export async function crewIdOf(email: string, index = 0) {
  const c = await signedIn(email)
  return (await c.get('/api/auth/me')).body.crews[index].id as string
}

/**
 * A person id as the crew table's CSV holds it: an id may start with '-', which the CSV escapes with
 * a leading quote like any cell a spreadsheet would read as a formula (OWASP "CSV Injection").
 */
export const csvPersonId = (record: Record<string, string>) => record['Person id']!.replace(/^'(?=[-=+@\t\r])/, '')
