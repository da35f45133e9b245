// Upload jobs: one row per uploaded file, its state and progress, run through the render pool.
import { and, eq } from 'drizzle-orm'
import { inspectUpload } from '../core/imaging/sniff'
import { isImageRejected } from '../core/imaging/errors'
import type { Actor } from './gate'

export type JobState = 'queued' | 'running' | 'done' | 'failed'

// Jobs this process is working on; a queued or running row not in here was cut off by a restart.
const active = new Set<string>()

export interface UploadedFile {
  name: string
  bytes: Uint8Array
}

export interface SniffedFile extends UploadedFile {
  problem: { status: number, message: string } | null
}

/** Checks each file before anything is decoded: byte size, magic bytes, header's pixel size. */
export function sniffFiles(files: UploadedFile[], maxBytes: number): SniffedFile[] {
  return files.map((f) => {
    try {
      inspectUpload(f.bytes, { maxBytes })
      return { ...f, problem: null }
    }
    catch (e) {
      if (isImageRejected(e)) return { ...f, problem: { status: e.status, message: e.message } }
      throw e
    }
  })
}

function setJob(id: string, values: Partial<typeof tables.jobs.$inferInsert>) {
  useDb().update(tables.jobs).set({ ...values, updatedAt: Date.now() }).where(eq(tables.jobs.id, id)).run()
}

/**
 * Creates one job per file: refused files become failed jobs with their message, the others are
 * queued and rendered in the pool. Returns the job ids in the order of the files.
 */
export function startRenderJobs(actor: Actor, deckId: string, type: { id: string, category: string }, aspect: string, files: SniffedFile[]) {
  const db = useDb()
  const jobs = files.map(f => ({ id: newId(), file: f }))
  db.transaction((tx) => {
    for (const { id, file } of jobs) {
      tx.insert(tables.jobs).values({
        id, userId: actor.id, deckId, kind: 'render', fileName: file.name.slice(0, 200),
        state: file.problem ? 'failed' : 'queued', progress: file.problem ? 1 : 0, message: file.problem?.message ?? null,
      }).run()
    }
  })
  for (const { id, file } of jobs) {
    if (!file.problem) {
      active.add(id)
      void runJob(id, type, aspect, file.bytes)
    }
  }
  return jobs.map(j => j.id)
}

async function runJob(jobId: string, type: { id: string, category: string }, aspect: string, bytes: Uint8Array) {
  const uploadsDir = useRuntimeConfig().uploadsDir
  let lastWrite = 0
  try {
    const sourceSha = sha256Of(bytes)
    if (hasSameView(useDb(), type.id, sourceSha)) throw new StoreRefused('This picture is already a view of this target type.')
    const result = await renderInPool(bytes, {
      backdrop: type.category === 'vessel' ? 'sea' : 'sky',
      seed: renderSeed(sourceSha, type.id),
      onStart: () => setJob(jobId, { state: 'running', progress: 0 }),
      onProgress: (p) => {
        // Progress rows are written at most every 150 ms; the last step is written on completion.
        if (Date.now() - lastWrite < 150) return
        lastWrite = Date.now()
        setJob(jobId, { state: 'running', progress: Math.min(0.99, p) })
      },
    })
    if (!result.ok) {
      setJob(jobId, { state: 'failed', progress: 1, message: result.message })
      return
    }
    const viewId = await storeView(useDb(), uploadsDir, { targetTypeId: type.id, aspect, source: result.source, renderings: result.renderings })
    setJob(jobId, { state: 'done', progress: 1, viewId, message: null })
  }
  catch (e) {
    setJob(jobId, { state: 'failed', progress: 1, message: failureMessage(e) })
  }
  finally {
    active.delete(jobId)
  }
}

function failureMessage(e: unknown) {
  if (e instanceof StoreRefused || e instanceof RenderTimeout) return e.message
  const code = (e as { code?: string })?.code
  if (code === 'ERR_WORKER_OUT_OF_MEMORY') return 'Processing this picture needed more memory than allowed. Scale it down and try again.'
  if (e instanceof Error && /queue is full/i.test(e.message)) return 'The server is busy with other uploads. Try again in a few minutes.'
  console.error('[render job]', e)
  return 'The picture could not be processed. Try again, or save it again as PNG.'
}

/** A job of its uploader (404 for anyone else), as api.md writes it. */
export function jobFor(actor: Actor, jobId: string) {
  const db = useDb()
  const job = db.select().from(tables.jobs).where(and(eq(tables.jobs.id, jobId), eq(tables.jobs.userId, actor.id))).get()
  if (!job) throw createError({ statusCode: 404, message: 'No such upload job.' })
  if ((job.state === 'queued' || job.state === 'running') && !active.has(job.id)) {
    const message = 'The server restarted while this picture was processed. Upload it again.'
    setJob(job.id, { state: 'failed', progress: 1, message })
    return { state: 'failed' as JobState, progress: 1, message }
  }
  return {
    state: job.state as JobState,
    progress: job.progress,
    ...(job.message ? { message: job.message } : {}),
    ...(job.viewId ? { viewId: job.viewId } : {}),
  }
}
