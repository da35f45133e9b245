import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'

// Apply pending migrations and make the uploads folder before the first request; checkpoint the
// WAL on a thread of its own (server/utils/checkpointer.ts).
export default defineNitroPlugin((nitroApp) => {
  const sqlite = useSqlite()
  mkdirSync(resolve(useRuntimeConfig().uploadsDir), { recursive: true })
  const checkpointer = startCheckpointer(sqlite)
  nitroApp.hooks.hook('close', () => checkpointer.stop())
})
