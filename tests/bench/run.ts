// npm run bench [-- --json] [-- NAME...]: runs every tests/bench/*.bench.ts in its own process.
// Each benchmark starts what it needs itself and prints figures (one JSON line each with --json).
import { spawnSync } from 'node:child_process'
import { readdirSync } from 'node:fs'
import { join, resolve } from 'node:path'

const args = process.argv.slice(2)
const json = args.includes('--json')
const only = args.filter(a => !a.startsWith('--'))
const dir = resolve('tests/bench')
const files = readdirSync(dir).filter(f => f.endsWith('.bench.ts') && (!only.length || only.some(o => f.startsWith(o)))).sort()
let failed = 0
for (const f of files) {
  if (!json) console.log(`\n== ${f}`)
  const r = spawnSync(process.execPath, [resolve('node_modules/tsx/dist/cli.mjs'), join(dir, f), ...(json ? ['--json'] : [])], { stdio: 'inherit' })
  if (r.status !== 0) failed++
}
if (!files.length) console.error('no benchmarks found')
process.exit(failed ? 1 : 0)
