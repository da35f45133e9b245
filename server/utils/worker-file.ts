// Where a worker thread's built code is: the built server (and nuxt dev) carries workers/<name>.mjs
// beside its chunks (server/workers/build-worker.ts); null when running from the sources (tests, scripts).
import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

export function builtWorker(name: string): string | null {
  let dir = dirname(fileURLToPath(import.meta.url))
  for (let i = 0; i < 4; i++) {
    const built = join(dir, 'workers', `${name}.mjs`)
    if (existsSync(built)) return built
    dir = dirname(dir)
  }
  return null
}
