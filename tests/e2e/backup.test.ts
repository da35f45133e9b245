// npm run db:backup -- FILE while the shared server takes writes, then the README's restore:
// a server started on the backup signs people in and has the data written before it.
import { execFile, spawn } from 'node:child_process'
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { promisify } from 'node:util'
import Database from 'better-sqlite3'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { Client, signedIn } from '../support/client'
import { freePort, outputEntry, testEnv, waitForHealth } from '../support/global-setup'

const run = promisify(execFile)
const dir = mkdtempSync(join(tmpdir(), 'glint-backup-'))
const stops: (() => Promise<unknown>)[] = []

afterAll(async () => {
  for (const s of stops) await s()
  rmSync(dir, { recursive: true, force: true })
})

describe('online backup and restore', () => {
  it('writes a consistent backup while the server takes writes, and a server restored from it has the data', async () => {
    const admin = await signedIn('admin@glint.demo')
    const before = await admin.post('/api/crews', { name: `Backup crew ${Date.now().toString(36)}` })
    expect(before.status).toBe(201)

    // Writes keep coming while the backup runs (SQLite's online backup restarts or copies a snapshot).
    let writing = true
    let during = 0
    const writer = (async () => {
      for (let i = 0; writing; i++) {
        const r = await admin.patch('/api/auth/me', { nightMode: i % 2 ? 'day' : 'auto' })
        if (r.status === 200) during++
      }
    })()
    const file = join(dir, 'glint-backup.sqlite')
    const env = { ...inject('serverEnv'), NUXT_DATABASE_PATH: inject('dbPath') }
    const { stdout } = await run(process.execPath, [resolve('node_modules/tsx/dist/cli.mjs'), 'server/scripts/backup.ts', file], { env })
    writing = false
    await writer
    expect(stdout).toMatch(/integrity: ok/)
    expect(during, 'the server answered writes during the backup').toBeGreaterThan(0)

    const check = new Database(file, { readonly: true })
    expect(check.pragma('integrity_check', { simple: true })).toBe('ok')
    expect(check.prepare('select count(*) as n from crews where id = ?').get(before.body.id)).toEqual({ n: 1 })
    check.close()

    // The README's restore: copy the backup to the file NUXT_DATABASE_PATH names (no -wal or -shm
    // beside it), start the server.
    const restoreDir = join(dir, 'restored')
    const port = await freePort()
    const restoredEnv = testEnv(restoreDir, port)
    mkdirSync(restoreDir, { recursive: true })
    copyFileSync(file, restoredEnv.NUXT_DATABASE_PATH!)
    expect(existsSync(`${restoredEnv.NUXT_DATABASE_PATH}-wal`)).toBe(false)
    const child = spawn(process.execPath, [outputEntry()], { env: restoredEnv, stdio: ['ignore', 'ignore', 'inherit'] })
    stops.push(() => new Promise((r) => {
      if (child.exitCode !== null) return r(null)
      child.once('exit', r)
      child.kill('SIGTERM')
    }))
    const url = `http://127.0.0.1:${port}`
    await waitForHealth(url, child)
    const restoredAdmin = await new Client(url).login('admin@glint.demo')
    const crews = await restoredAdmin.get<{ id: string, name: string }[]>('/api/crews')
    expect(crews.status).toBe(200)
    expect(crews.body.map(c => c.id)).toContain(before.body.id)
    // A trainee signs in on the restored server too.
    expect((await (await new Client(url).login('trainee@glint.demo')).get('/api/auth/me')).body.email).toBe('trainee@glint.demo')
  }, 120_000)
})
