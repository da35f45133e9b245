// Route discovery (shared by the access matrix and the hostile corpus), the hostile inputs,
// a raw-socket sender for bodies whose Content-Length lies, and a snapshot of every table.
import { createHash } from 'node:crypto'
import { readFileSync, readdirSync, statSync } from 'node:fs'
import { connect } from 'node:net'
import { join, relative } from 'node:path'
import Database from 'better-sqlite3'

export function routeFiles(dir = 'server/api'): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f)
    return statSync(p).isDirectory() ? routeFiles(p) : [p]
  }).filter(f => f.endsWith('.ts'))
}

// watches -> watch, crews -> crew, target-types -> target-type
const singular = (word: string) => word.replace(/(ch|sh|ss|x)es$/, '$1').replace(/s$/, '')

// server/api/crews/[id]/members/[userId].delete.ts -> DELETE /api/crews/:crew/members/:user
export function routeKey(file: string) {
  const rel = relative('server', file).replace(/\\/g, '/').replace(/\.ts$/, '')
  const m = rel.match(/^(.*?)(?:\.(get|post|patch|put|delete))?$/)!
  const method = (m[2] ?? 'get').toUpperCase()
  // A parameter is named by the folder before it: crews/[id] -> :crew, users/[id] -> :user.
  const path = `/${m[1]!}`.replace(/\/index$/, '')
    .replace(/([\w-]+)\/\[id\]/g, (_, kind: string) => `${kind}/:${singular(kind)}`)
    .replace(/\[(\w+?)Id\]/g, (_, kind: string) => `:${kind}`)
    .replace(/\[\.{3}(\w+)\]/g, (_, name: string) => `:${name}`)
  return `${method} ${path}`
}

export interface Route {
  key: string
  method: string
  path: string
  file: string
  params: string[]
  // What the handler reads, from its source: a body, a query string.
  readsBody: boolean
  readsQuery: boolean
}

export function discoverRoutes(dir = 'server/api'): Route[] {
  return routeFiles(dir).map((file) => {
    const key = routeKey(file)
    const [method, path] = key.split(' ') as [string, string]
    const src = readFileSync(file, 'utf8')
    return {
      key, method, path, file,
      params: [...path.matchAll(/:(\w+)/g)].map(m => m[1]!),
      readsBody: /\b(readInput|readBody|readValidatedBody|readRawBody|readMultipartFormData|readFormData)\s*\(/.test(src),
      readsQuery: /\b(queryInput|getQuery|getValidatedQuery)\s*\(/.test(src),
    }
  })
}

export const UNSAFE_METHODS = ['POST', 'PUT', 'PATCH', 'DELETE']

const SQL = '\' OR 1=1 --'
const TRAVERSAL = '..%2F..%2Fetc%2Fpasswd'
// Field names the routes use; a body fills each with the same hostile value.
const FIELDS = ['id', 'email', 'password', 'name', 'token', 'role', 'userId', 'crewId', 'deckId', 'targetTypeId',
  'choiceId', 'title', 'aspect', 'latencyMs', 'framesShown', 'frameIntervalMs', 'days', 'minAccuracy', 'simpleMs']
const everyField = (v: unknown) => Object.fromEntries(FIELDS.map(f => [f, v]))

function nested(depth: number) {
  return '['.repeat(depth) + ']'.repeat(depth)
}

export interface BodyCase {
  name: string
  body: string
  type?: string
}

// Bodies a route that reads JSON must refuse with a 4xx.
export const BODY_CASES: BodyCase[] = [
  { name: 'malformed JSON', body: '{"email": "a@b.c", ' },
  { name: 'a JSON array', body: '[1, 2, 3]' },
  { name: 'a JSON string', body: '"just a string"' },
  { name: 'a JSON number', body: '42' },
  { name: 'JSON null', body: 'null' },
  { name: 'numbers where strings go', body: JSON.stringify(everyField(12345)) },
  { name: 'objects where values go', body: JSON.stringify(everyField({ nested: true })) },
  { name: 'arrays where values go', body: JSON.stringify(everyField(['a', 'b'])) },
  { name: 'a 1 MB string', body: JSON.stringify({ email: 'x'.repeat(1024 * 1024) }) },
  { name: '10000 levels of nesting', body: nested(10_000) },
  { name: '10000 levels of nested objects', body: '{"a":'.repeat(10_000) + '1' + '}'.repeat(10_000) },
  { name: 'operator objects', body: JSON.stringify(everyField({ $gt: '' })) },
  { name: '__proto__ pollution', body: '{"__proto__": {"admin": true, "roles": ["admin"]}, "constructor": {"prototype": {"admin": true}}}' },
  { name: 'SQL fragments in ids and numbers', body: JSON.stringify(everyField(SQL)) },
  { name: 'path traversal in ids', body: JSON.stringify(everyField('../../etc/passwd')) },
  { name: 'an escaped NUL byte', body: JSON.stringify(everyField('a\u0000b')) },
  { name: 'a raw NUL byte', body: '{"email": "a\u0000b"}' },
  { name: 'JSON as text/plain', body: JSON.stringify({ email: 'a@b.c' }), type: 'text/plain' },
  { name: 'a form post', body: 'email=a%40b.c&password=x&name=x', type: 'application/x-www-form-urlencoded' },
  { name: 'multipart where JSON goes', body: '--b\r\nContent-Disposition: form-data; name="email"\r\n\r\nx\r\n--b--\r\n', type: 'multipart/form-data; boundary=b' },
  { name: 'XML', body: '<?xml version="1.0"?><!DOCTYPE x [<!ENTITY e SYSTEM "file:///etc/passwd">]><x>&e;</x>', type: 'application/xml' },
]

// Bodies refused by the server's middleware before any route runs (so for every route).
export const GUARD_CASES: BodyCase[] = [
  { name: 'an oversize body (100 KB)', body: JSON.stringify({ email: 'y'.repeat(100 * 1024) }) },
  { name: 'a wrong content type', body: '{}', type: 'text/plain' },
  { name: 'an escaped NUL byte', body: '{"name": "a\\u0000"}' },
]

// ('%2e%2e' is left out: the client folds it into the path before it is sent.)
export const PARAM_VALUES = [TRAVERSAL, SQL, '%00', 'a'.repeat(300), '$gt', '__proto__', '%2F']
export const QUERY_VALUES = [SQL, TRAVERSAL, '%00', 'x'.repeat(5000), '[object Object]']
export const QUERY_KEYS = ['token', 'deckId', 'days', 'id', 'crewId', 'userId', 'limit', 'from', 'to', 'since']

// An HTTP/1.1 exchange on a raw socket: what a client that lies in Content-Length can send.
// Returns the status of every response the server writes before it closes the connection.
export function rawExchange(base: string, head: string, body: Buffer | string, opts: { waitMs?: number } = {}): Promise<number[]> {
  const url = new URL(base)
  return new Promise((resolve, reject) => {
    const socket = connect(Number(url.port), url.hostname)
    let text = ''
    const done = () => {
      socket.destroy()
      resolve([...text.matchAll(/HTTP\/1\.1 (\d{3})/g)].map(m => Number(m[1])))
    }
    const timer = setTimeout(done, opts.waitMs ?? 3000)
    socket.on('data', (d) => {
      text += d.toString('latin1')
    })
    socket.on('close', () => {
      clearTimeout(timer)
      done()
    })
    socket.on('error', (e: NodeJS.ErrnoException) => {
      // A reset after the server answered and closed is expected for a body it refused.
      if (e.code === 'ECONNRESET' || e.code === 'EPIPE') return
      clearTimeout(timer)
      reject(e)
    })
    socket.write(head.replace(/\n/g, '\r\n') + '\r\n')
    socket.write(body)
  })
}

// Every table's row count and a digest of its content: equal snapshots mean nothing changed.
export function snapshot(dbPath: string) {
  const db = new Database(dbPath, { readonly: true, fileMustExist: true })
  try {
    const names = db.prepare(`select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name`)
      .all() as { name: string }[]
    return Object.fromEntries(names.map(({ name }) => {
      const rows = db.prepare(`select * from "${name}" order by rowid`).raw().all()
      const digest = createHash('sha256').update(JSON.stringify(rows)).digest('hex').slice(0, 16)
      return [name, `${rows.length} rows ${digest}`]
    }))
  }
  finally {
    db.close()
  }
}
