import { inArray } from 'drizzle-orm'

// Upload jobs left queued or running by a stopped server can never finish: mark them failed
// at start, with a message the uploader can act on (their files were never stored).
export default defineNitroPlugin(() => {
  const r = useDb().update(tables.jobs)
    .set({ state: 'failed', progress: 1, message: 'The server restarted before this file was processed. Upload it again.', updatedAt: Date.now() })
    .where(inArray(tables.jobs.state, ['queued', 'running'])).run()
  if (r.changes) console.log(`[jobs] ${r.changes} unfinished upload jobs marked failed after a restart`)
})
