// A second built server on a copy of the e2e database, with its own environment (for tests of
// configuration: what the server says at start and does without a setting). Its stderr is kept.
import { spawn } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { inject } from 'vitest'
import { freePort, outputEntry, testEnv, waitForHealth } from './global-setup'

export interface OwnServer { url: string, log: () => string, stop: () => Promise<void> }

export async function ownServer(overrides: Record<string, string>): Promise<OwnServer> {
  const dir = mkdtempSync(join(tmpdir(), 'glint-own-'))
  const env = { ...testEnv(dir, await freePort()), ...overrides }
  mkdirSync(env.NUXT_UPLOADS_DIR!, { recursive: true })
  const source = new Database(inject('dbPath'), { readonly: true })
  await source.backup(env.NUXT_DATABASE_PATH!)
  source.close()
  const url = `http://127.0.0.1:${env.PORT}`
  let stderr = ''
  const child: ChildProcess = spawn(process.execPath, [outputEntry()], { env, stdio: ['ignore', 'pipe', 'pipe'] })
  const keep = (d: Buffer) => {
    stderr += d.toString()
  }
  child.stderr!.on('data', keep)
  child.stdout!.on('data', keep)
  await waitForHealth(url, child)
  return {
    url,
    log: () => stderr,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) {
        const exited = new Promise(r => child.once('exit', r))
        child.kill('SIGTERM')
        await exited
      }
      rmSync(dir, { recursive: true, force: true })
    },
  }
}
