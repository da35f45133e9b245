// Kill test: 20 concurrent clients make acknowledged writes; the server is killed with SIGKILL in
// the middle, restarted on the same file, and every acknowledged write must be there, with a
// clean PRAGMA integrity_check (SQLite, "How To Corrupt An SQLite Database File" and WAL docs:
// a committed WAL transaction survives a crash of the process).
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { Client } from '../support/client'
import { freePort, outputEntry, testEnv, waitForHealth } from '../support/global-setup'

const CALL_ROUTE = 'server/api/sightings/[id]/call.post.ts'
const CLIENTS = 20
const TRAINEES = ['trainee@glint.demo', 'trainee2@glint.demo', 'trainee3@glint.demo', 'trainee4@glint.demo',
  'trainee5@glint.demo', 'trainee6@glint.demo', 'trainee7@glint.demo', 'trainee8@glint.demo']

const dir = mkdtempSync(join(tmpdir(), 'glint-kill-'))
let child: ChildProcess | undefined

function start(env: Record<string, string>) {
  const c = spawn(process.execPath, [outputEntry()], { env, stdio: ['ignore', 'ignore', 'inherit'] })
  child = c
  return c
}

async function stop(c: ChildProcess, signal: NodeJS.Signals) {
  if (c.exitCode !== null || c.signalCode !== null) return
  const exited = new Promise(r => c.once('exit', r))
  c.kill(signal)
  await exited
}

afterAll(async () => {
  if (child) await stop(child, 'SIGTERM')
  rmSync(dir, { recursive: true, force: true })
})

describe('durability', () => {
  it('keeps every acknowledged write across a SIGKILL in the middle of 20 concurrent writers', async () => {
    // Its own seeded database: a consistent copy of the seeded test database (seeding takes a minute).
    const env = testEnv(dir, await freePort())
    const source = new Database(inject('dbPath'), { readonly: true })
    await source.backup(env.NUXT_DATABASE_PATH!)
    source.close()
    const url = `http://127.0.0.1:${env.PORT}`
    const server = start(env)
    await waitForHealth(url, server)

    const admin = await new Client(url).login('admin@glint.demo')
    // The watch's calls when the route exists, else crews made by the admin; both when there is room.
    const useCalls = existsSync(CALL_ROUTE)
    const pending: { client: Client, sightingId: string, choiceId: string | null }[] = []
    if (useCalls) {
      for (const email of TRAINEES) {
        const t = await new Client(url).login(email)
        const w = await t.post('/api/watches', {})
        expect(w.status, `${email} gets a watch`).toBe(200)
        for (const s of w.body.sightings ?? []) {
          if (!s.called) pending.push({ client: t, sightingId: s.id, choiceId: s.choices[0]?.id ?? null })
        }
      }
      expect(pending.length, 'sightings to call').toBeGreaterThan(CLIENTS)
    }

    const ackedCalls: string[] = []
    const ackedCrews: string[] = []
    let stopAt = Infinity
    let failures = 0
    const target = useCalls ? pending.length : 150
    let cutOff = 0
    const writer = async (n: number) => {
      for (let i = 0; ; i++) {
        if (ackedCalls.length + ackedCrews.length >= stopAt) return
        const next = useCalls && n % 2 === 0 ? pending.shift() : undefined
        try {
          if (next) {
            const r = await next.client.post(`/api/sightings/${next.sightingId}/call`, {
              choiceId: next.choiceId, latencyMs: 900 + n, framesShown: 54, frameIntervalMs: 16.7,
            })
            if (r.status === 200) ackedCalls.push(next.sightingId)
            else failures++
          }
          else {
            const r = await admin.post('/api/crews', { name: `Kill test crew ${n}-${i}` })
            if (r.status === 201) ackedCrews.push(r.body.id)
            else failures++
          }
        }
        catch {
          // The connection died with the server: this write was never acknowledged.
          cutOff++
          return
        }
      }
    }
    const writers = Array.from({ length: CLIENTS }, (_, n) => writer(n))
    while (ackedCalls.length + ackedCrews.length < target) await new Promise(r => setTimeout(r, 5))
    await stop(server, 'SIGKILL')
    stopAt = 0
    await Promise.all(writers)
    expect(server.signalCode).toBe('SIGKILL')
    expect(failures, 'no write was refused while the server ran').toBe(0)
    expect(cutOff, 'writes were in flight when the server was killed').toBeGreaterThan(0)
    expect(ackedCalls.length + ackedCrews.length).toBeGreaterThanOrEqual(target)
    if (useCalls) expect(ackedCalls.length).toBeGreaterThan(0)

    // Restart on the same file: migrations and WAL recovery run, then every acknowledged write is read back.
    const again = start(env)
    await waitForHealth(url, again)
    const admin2 = await new Client(url).login('admin@glint.demo')
    const crews = await admin2.get<{ id: string }[]>('/api/crews')
    const crewIds = new Set(crews.body.map(c => c.id))
    expect(ackedCrews.filter(id => !crewIds.has(id)), 'acknowledged crews missing after the crash').toEqual([])
    const db = new Database(env.NUXT_DATABASE_PATH!, { readonly: true })
    const called = new Set((db.prepare('select sighting_id as id from calls').all() as { id: string }[]).map(r => r.id))
    expect(ackedCalls.filter(id => !called.has(id)), 'acknowledged calls missing after the crash').toEqual([])
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok')
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal')
    db.close()
    console.log(`kill test: ${ackedCalls.length} calls and ${ackedCrews.length} crews acknowledged before SIGKILL, ${cutOff} cut off, all acknowledged present`)
  }, 120_000)
})
