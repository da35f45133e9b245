// A small published deck written straight into the test database (the running server sees it
// through WAL): invented aircraft types, views at two aspects, a rendering per condition as real
// tiny WebP files under the test server's uploads dir. Idempotent within one test run.
import { createHash, randomBytes } from 'node:crypto'
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import Database from 'better-sqlite3'
import encode, { init } from '@jsquash/webp/encode.js'
import { inject } from 'vitest'
import { CONDITIONS } from '../../shared/utils/conditions'

export const FIXTURE_DECK_TITLE = 'Fixture drill deck (test)'
export const FIXTURE_ASPECTS = ['beam', 'head-on'] as const

// Invented types (no real aircraft): name, span in metres, features, body and wing proportions.
const TYPES = [
  { name: 'Brantwing', sizeM: 14, features: { wings: 'straight, mid-set', engines: 'two, under the wings', tail: 'twin fins' }, body: 0.7, wing: 0.9 },
  { name: 'Corvel', sizeM: 11, features: { wings: 'swept, low-set', engines: 'one, in the tail', tail: 'T-tail' }, body: 0.55, wing: 0.6 },
  { name: 'Dunmark', sizeM: 32, features: { wings: 'swept, high-set', engines: 'four, podded', tail: 'single fin' }, body: 0.85, wing: 1 },
  { name: 'Elsker', sizeM: 9, features: { wings: 'delta', engines: 'one, buried', tail: 'no tailplane' }, body: 0.5, wing: 0.45 },
  { name: 'Fennick', sizeM: 18, features: { wings: 'straight, high-set', engines: 'two, on the wings', tail: 'single fin' }, body: 0.65, wing: 0.8 },
  { name: 'Garrow', sizeM: 24, features: { wings: 'swept, low-set', engines: 'two, under the wings', tail: 'single fin' }, body: 0.8, wing: 0.75 },
]

// Background and target grey levels per condition (rough scene brightness, for the eye only).
const SCENE: Record<string, [number, number]> = {
  'backlit': [230, 25], 'sunlit': [110, 215], 'dark-cloud': [60, 35], 'white-cloud': [235, 40], 'haze': [190, 120], 'goggles': [20, 8],
}

export interface WatchFixture {
  deckId: string
  crewId: string
  types: { id: string, name: string }[]
}

let encoderReady: Promise<void> | null = null

function ready() {
  encoderReady ??= (async () => {
    const require = createRequire(import.meta.url)
    const wasm = join(dirname(require.resolve('@jsquash/webp/package.json')), 'codec/enc/webp_enc.wasm')
    await init(await WebAssembly.compile(readFileSync(wasm)))
  })()
  return encoderReady
}

function silhouette(width: number, height: number, t: typeof TYPES[number], aspect: string, condition: string, salt: number, tint = 0) {
  const [bg, fg] = SCENE[condition]!
  const data = new Uint8ClampedArray(width * height * 4)
  const cx = width / 2
  const cy = height / 2
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const dx = (x - cx) / width
      const dy = (y - cy) / height
      let inside: boolean
      if (aspect === 'beam') inside = (Math.abs(dy) < 0.06 && Math.abs(dx) < t.body / 2) || (Math.abs(dx + 0.05) < 0.08 && dy > -0.02 && dy < 0.05 + t.wing * 0.08)
      else inside = (dx * dx) / 0.004 + (dy * dy) / 0.01 < 1 || (Math.abs(dy) < 0.02 && Math.abs(dx) < t.wing / 2)
      const g = inside ? fg : bg
      const i = (y * width + x) * 4
      data[i] = Math.min(255, g + tint)
      data[i + 1] = g
      data[i + 2] = Math.min(255, g + (inside ? 0 : 25) + (salt % 7))
      data[i + 3] = 255
    }
  }
  return data
}

/** Inserts the fixture deck once (found again by its title), assigned to the first demo crew. */
export async function ensureWatchFixture(): Promise<WatchFixture> {
  const crewId = readDb(db => (db.prepare('SELECT id FROM crews WHERE name = ?').get('Skerrow Point Station') as { id: string }).id)
  const ownerId = readDb(db => (db.prepare('SELECT id FROM users WHERE email = ?').get('instructor@glint.demo') as { id: string }).id)
  return ensureWatchDeck({ title: FIXTURE_DECK_TITLE, crewId, ownerId })
}

/** A published drill deck (the fixture's types, views and renderings) with its own title, owner and crew; made once per title. */
// tint (a red shift of every pixel) keeps each deck's files apart: a rendering's file name is its content hash.
export async function ensureWatchDeck(o: { title: string, crewId: string, ownerId: string, tint?: number }): Promise<WatchFixture> {
  const db = new Database(inject('dbPath'))
  db.pragma('busy_timeout = 5000')
  try {
    const crew = { id: o.crewId }
    const found = db.prepare('SELECT id FROM decks WHERE title = ?').get(o.title) as { id: string } | undefined
    if (found) {
      const types = db.prepare('SELECT id, name FROM target_types WHERE deck_id = ? ORDER BY name').all(found.id) as { id: string, name: string }[]
      return { deckId: found.id, crewId: crew.id, types }
    }
    await ready()
    const owner = { id: o.ownerId }
    const dir = join(inject('uploadsDir'), 'renders')
    mkdirSync(dir, { recursive: true })
    const id = () => randomBytes(16).toString('base64url')
    const deckId = id()
    const files: { viewId: string, condition: string, file: string, bytes: number }[] = []
    const typeRows: { id: string, name: string }[] = []
    const viewRows: { id: string, typeId: string, aspect: string }[] = []
    let salt = 0
    for (const t of TYPES) {
      const typeId = id()
      typeRows.push({ id: typeId, name: t.name })
      for (const aspect of FIXTURE_ASPECTS) {
        const viewId = id()
        viewRows.push({ id: viewId, typeId, aspect })
        for (const condition of CONDITIONS) {
          const pixels = silhouette(320, 214, t, aspect, condition, salt++, o.tint)
          const bytes = new Uint8Array(await encode({ data: pixels, width: 320, height: 214, colorSpace: 'srgb' } as ImageData, { quality: 70 }))
          const file = `${createHash('sha256').update(bytes).digest('hex')}.webp`
          writeFileSync(join(dir, file), bytes)
          files.push({ viewId, condition, file, bytes: bytes.length })
        }
      }
    }
    db.transaction(() => {
      db.prepare(`INSERT INTO decks (id, title, description, category, owner_id, status) VALUES (?, ?, 'Written by the tests.', 'aircraft', ?, 'published')`)
        .run(deckId, o.title, owner.id)
      db.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (?, ?)').run(deckId, crew.id)
      TYPES.forEach((t, i) => {
        db.prepare(`INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, 'aircraft', 'neutral', ?, ?)`)
          .run(typeRows[i]!.id, deckId, t.name, t.sizeM, JSON.stringify(t.features))
      })
      db.prepare('INSERT INTO look_alikes (type_id, other_id) VALUES (?, ?)').run(typeRows[1]!.id, typeRows[3]!.id)
      for (const v of viewRows) {
        db.prepare('INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, ?, ?, 320, 214)')
          .run(v.id, v.typeId, v.aspect, createHash('sha256').update(v.id).digest('hex'))
      }
      for (const f of files) {
        db.prepare('INSERT INTO variants (id, view_id, condition, width, height, bytes, contrast, file) VALUES (?, ?, ?, 320, 214, ?, -0.8, ?)')
          .run(id(), f.viewId, f.condition, f.bytes, f.file)
      }
    })()
    return { deckId, crewId: crew.id, types: typeRows.sort((a, b) => a.name.localeCompare(b.name)) }
  }
  finally {
    db.close()
  }
}

/** Every deck published to a crew, with its type names: the fixture and the demo decks when present. */
export function publishedDecks(crewId: string) {
  const db = new Database(inject('dbPath'), { readonly: true })
  try {
    const decks = db.prepare(`SELECT d.id, d.title FROM decks d JOIN deck_crews dc ON dc.deck_id = d.id
      WHERE dc.crew_id = ? AND d.status = 'published' ORDER BY d.title`).all(crewId) as { id: string, title: string }[]
    return decks.map(d => ({
      ...d,
      types: db.prepare('SELECT id, name FROM target_types WHERE deck_id = ?').all(d.id) as { id: string, name: string }[],
    }))
  }
  finally {
    db.close()
  }
}

/** A read-only look into the test database. */
export function readDb<T>(fn: (db: Database.Database) => T): T {
  const db = new Database(inject('dbPath'), { readonly: true })
  try {
    return fn(db)
  }
  finally {
    db.close()
  }
}

/** A short write to the test database (e.g. to age a test trainee's tracks). */
export function writeDb<T>(fn: (db: Database.Database) => T): T {
  const db = new Database(inject('dbPath'))
  db.pragma('busy_timeout = 5000')
  try {
    return fn(db)
  }
  finally {
    db.close()
  }
}

let traineeCount = 0
let hashOf: Promise<string> | null = null
export const TRAINEE_PASSWORD = 'a long enough drill phrase'

/**
 * A new trainee written straight into the test database (so drilling never changes the demo
 * accounts, and no invitation quota is spent), signed in through the real login route.
 */
export async function drillTrainee(crewId: string) {
  return directPerson(['trainee'], crewId)
}

/** A new person with these roles in this crew (or none), written straight into the test database, signed in unless told. */
export async function directPerson(roles: string[], crewId: string | null, signIn = true) {
  hashOf ??= import('@adonisjs/hash/drivers/scrypt').then(({ Scrypt }) => new Scrypt({}).make(TRAINEE_PASSWORD))
  const hash = await hashOf
  const id = randomBytes(16).toString('base64url')
  const email = `drill-${Date.now().toString(36)}-${++traineeCount}@glint.test`
  writeDb((db) => {
    db.transaction(() => {
      db.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)').run(id, email, `Drill ${roles.join(' ')} ${traineeCount}`, hash)
      for (const role of roles) db.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, ?)').run(id, role)
      if (crewId) db.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run(crewId, id)
    })()
  })
  const { Client } = await import('./client')
  const client = new Client()
  if (signIn) await client.login(email, TRAINEE_PASSWORD)
  return { id, email, client }
}
