// The built server a benchmark runs: .output-<tag>/, built again when it is missing or older than
// the app's sources (app, server, shared, drizzle, nuxt.config.ts), so figures never come from a stale build.
import { execFileSync } from 'node:child_process'
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join, resolve } from 'node:path'

const SOURCES = ['app', 'server', 'shared', 'drizzle', 'nuxt.config.ts']

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0
  const s = statSync(path)
  if (!s.isDirectory()) return s.mtimeMs
  let newest = 0
  for (const f of readdirSync(path)) newest = Math.max(newest, newestMtime(join(path, f)))
  return newest
}

/** The server entry of .output-<tag>/, after building it if any source is newer than it (or any `needs` file is missing). */
export function ensureBuild(tag: string, options: { quiet?: boolean, needs?: readonly string[] } = {}): string {
  const out = resolve(`.output-${tag}`)
  const entry = join(out, 'server/index.mjs')
  const sources = Math.max(...SOURCES.map(newestMtime))
  const complete = existsSync(entry) && (options.needs ?? []).every(f => existsSync(join(out, f)))
  if (complete && statSync(entry).mtimeMs > sources) return entry
  if (!options.quiet) console.log(`building the server with GLINT_BUILD_TAG=${tag} ...`)
  execFileSync(process.execPath, [resolve('node_modules/nuxt/bin/nuxt.mjs'), 'build'], {
    env: { ...process.env, GLINT_BUILD_TAG: tag }, stdio: options.quiet ? 'ignore' : 'inherit',
  })
  return entry
}
