import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'

// Apply pending migrations and make the uploads folder before the first request.
export default defineNitroPlugin(() => {
  useDb()
  mkdirSync(resolve(useRuntimeConfig().uploadsDir), { recursive: true })
})
