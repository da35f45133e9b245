// Starts the built server on a fresh SQLite file with the demo seed, for the e2e and browser projects.
import { execFileSync, spawn } from 'node:child_process'
import { createHash, randomBytes } from 'node:crypto'
import type { ChildProcess } from 'node:child_process'
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, relative, resolve } from 'node:path'
import type { TestProject } from 'vitest/node'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    dbPath: string
    uploadsDir: string
    serverEnv: Record<string, string>
  }
}

export function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const s = createServer()
    s.once('error', fail)
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port
      s.close(() => ok(port))
    })
  })
}

export function outputEntry() {
  const tag = process.env.GLINT_BUILD_TAG
  return resolve(tag ? `.output-${tag}` : '.output', 'server/index.mjs')
}

export async function waitForHealth(url: string, child: ChildProcess, timeoutMs = 30_000) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}`)
    try {
      const r = await fetch(`${url}/api/health`)
      if (r.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 150))
  }
  throw new Error('server did not answer /api/health in time')
}

// The process settings scripts/start.sh runs the server with (npm start, npm run demo).
const START_TUNABLES = readFileSync('scripts/malloc-tunables', 'utf8').trim()

export function testEnv(dir: string, port: number): Record<string, string> {
  return {
    ...process.env as Record<string, string>,
    GLIBC_TUNABLES: process.env.GLIBC_TUNABLES ?? START_TUNABLES,
    NODE_ENV: 'production',
    NUXT_DATABASE_PATH: join(dir, 'glint.sqlite'),
    NUXT_UPLOADS_DIR: join(dir, 'uploads'),
    NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex'),
    NUXT_MAIL_URL: '',
    PORT: String(port),
    HOST: '127.0.0.1',
    // Links in mail come from here only; the tests send X-Forwarded-For as if through a local proxy.
    NUXT_PUBLIC_URL: `http://127.0.0.1:${port}`,
    NUXT_TRUSTED_PROXIES: 'loopback',
  }
}

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f)
    return statSync(p).isDirectory() ? filesUnder(p) : [p]
  })
}

// The seeded demo (people, decks with their renderings, history through the domain's watch and call
// code) depends only on these sources: seed it once into tests/.tmp/seed-<hash>/ and give each run a copy.
function seededTemplate() {
  const sources = ['server/seed', 'server/scripts/seed.ts', 'server/core', 'server/domain', 'server/utils', 'server/database', 'shared', 'drizzle']
    .flatMap(p => statSync(p).isDirectory() ? filesUnder(p) : [p]).sort()
  const hash = createHash('sha256')
  for (const f of sources) hash.update(relative('.', f)).update(readFileSync(f))
  const dir = resolve('tests/.tmp', `seed-${hash.digest('hex').slice(0, 16)}`)
  if (!existsSync(join(dir, 'glint.sqlite'))) {
    const work = `${dir}.work-${process.pid}`
    rmSync(work, { recursive: true, force: true })
    mkdirSync(work, { recursive: true })
    const env = { ...testEnv(work, 0), NUXT_DATABASE_PATH: join(work, 'glint.sqlite'), NUXT_UPLOADS_DIR: join(work, 'uploads') }
    execFileSync(process.execPath, [resolve('node_modules/tsx/dist/cli.mjs'), 'server/scripts/seed.ts'], { env, stdio: 'inherit' })
    // Fold the WAL into the main file so a plain copy is complete.
    execFileSync(process.execPath, ['-e', `const D=require('better-sqlite3');const d=new D(${JSON.stringify(join(work, 'glint.sqlite'))});d.pragma('wal_checkpoint(TRUNCATE)');d.close()`])
    try {
      renameSync(work, dir)
    }
    catch {
      rmSync(work, { recursive: true, force: true }) // another run finished it first
    }
  }
  return dir
}

// A fresh copy of the seeded demo in `dir` (glint.sqlite and uploads/).
export function seedInto(dir: string) {
  const template = seededTemplate()
  cpSync(join(template, 'glint.sqlite'), join(dir, 'glint.sqlite'))
  if (existsSync(join(template, 'uploads'))) cpSync(join(template, 'uploads'), join(dir, 'uploads'), { recursive: true })
  else mkdirSync(join(dir, 'uploads'), { recursive: true })
}

export default async function setup(project: TestProject) {
  const entry = outputEntry()
  if (!existsSync(entry)) throw new Error(`no built server at ${entry}: run npm run build first`)
  const dir = mkdtempSync(join(tmpdir(), 'glint-test-'))
  const port = await freePort()
  const env = testEnv(dir, port)
  seedInto(dir)
  const child = spawn(process.execPath, [entry], { env, stdio: ['ignore', 'inherit', 'inherit'] })
  const baseUrl = `http://127.0.0.1:${port}`
  await waitForHealth(baseUrl, child)
  project.provide('baseUrl', baseUrl)
  project.provide('dbPath', env.NUXT_DATABASE_PATH!)
  project.provide('uploadsDir', env.NUXT_UPLOADS_DIR!)
  project.provide('serverEnv', env)
  return async () => {
    child.kill('SIGTERM')
    await new Promise(r => child.once('exit', r))
    rmSync(dir, { recursive: true, force: true })
  }
}
