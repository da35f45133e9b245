// Stores a processed upload: its WebP renderings as content-addressed files and the view and
// variant rows. Used by the upload jobs and by the demo seed, so it imports everything explicitly
// (the seed runs under tsx, without Nitro).
import { createHash, randomBytes } from 'node:crypto'
import { mkdirSync } from 'node:fs'
import { link, rm, unlink, writeFile } from 'node:fs/promises'
import { join, resolve } from 'node:path'
import { and, eq } from 'drizzle-orm'
import type { GlintDb } from '../database/client'
import * as t from '../database/schema'
import type { RenderedFile } from '../workers/render-worker'
import { newId } from './ids'

/** A rendering as the render worker returns it, without the size rung it was drawn at. */
export type StoredRendering = Omit<RenderedFile, 'size'>

export interface ViewToStore {
  targetTypeId: string
  aspect: string
  source: { sha256: string, width: number, height: number }
  renderings: StoredRendering[]
}

/** A failure to store that the uploader can act on (a duplicate, a target type removed meanwhile). */
export class StoreRefused extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'StoreRefused'
  }
}

export function sha256Of(bytes: Uint8Array) {
  return createHash('sha256').update(bytes).digest('hex')
}

// The backgrounds of a rendering follow from the picture and its target type, so the same
// picture renders the same way again, and differently (other files) for another target type.
export function renderSeed(sourceSha: string, targetTypeId: string) {
  return Number.parseInt(createHash('sha256').update(`${sourceSha}:${targetTypeId}`).digest('hex').slice(0, 8), 16)
}

export function rendersDir(uploadsDir: string) {
  return join(resolve(uploadsDir), 'renders')
}

export function renderFileName(sha256: string) {
  return `${sha256}.webp`
}

/** A view of the same picture for this target type already exists. */
export function hasSameView(db: Pick<GlintDb, 'select'>, targetTypeId: string, sourceSha: string) {
  return !!db.select({ id: t.views.id }).from(t.views)
    .where(and(eq(t.views.targetTypeId, targetTypeId), eq(t.views.sourceSha, sourceSha))).get()
}

// A removed view keeps its files for the trash's retention period (decks.ts, VIEW_TRASH_DAYS), so the
// same picture uploaded again meets them: the way back is to restore it.
const ALREADY_STORED = 'This picture is already stored as a view, or waits in the deck\'s removed views (put it back from there). Upload a different picture.'

/**
 * Writes each rendering under a temporary name and links it to its content-addressed name
 * (link fails if the name exists, so a file another view owns is never replaced), then inserts
 * the view and its variants in one transaction. On any failure every file it made is removed
 * and no row is left. Returns the new view's id.
 */
export async function storeView(db: GlintDb, uploadsDir: string, view: ViewToStore): Promise<string> {
  const dir = rendersDir(uploadsDir)
  mkdirSync(dir, { recursive: true })
  const made: string[] = []
  try {
    for (const r of view.renderings) {
      const tmp = join(dir, `.tmp-${randomBytes(12).toString('hex')}`)
      const final = join(dir, renderFileName(r.sha256))
      await writeFile(tmp, r.webp, { flag: 'wx' })
      try {
        await link(tmp, final)
        made.push(final)
      }
      catch (e) {
        if ((e as NodeJS.ErrnoException).code === 'EEXIST') throw new StoreRefused(ALREADY_STORED)
        throw e
      }
      finally {
        await unlink(tmp).catch(() => {})
      }
    }
    const id = newId()
    db.transaction((tx) => {
      const type = tx.select({ id: t.targetTypes.id, definitionId: t.targetTypes.definitionId }).from(t.targetTypes).where(eq(t.targetTypes.id, view.targetTypeId)).get()
      if (!type) throw new StoreRefused('The target type was removed while the picture was processed.')
      // A view belongs to the target type's shared definition: every deck's row of it gets the view
      // (its own rows, the same files), unless that row has this picture already. Rows linked while
      // the picture was processed are included: they are read here, in the same transaction.
      const rows = tx.select({ id: t.targetTypes.id }).from(t.targetTypes).where(eq(t.targetTypes.definitionId, type.definitionId)).all()
      for (const row of rows) {
        if (row.id !== type.id && hasSameView(tx, row.id, view.source.sha256)) continue
        const viewId = row.id === type.id ? id : newId()
        tx.insert(t.views).values({
          id: viewId, targetTypeId: row.id, aspect: view.aspect, sourceSha: view.source.sha256, width: view.source.width, height: view.source.height,
        }).run()
        for (const r of view.renderings) {
          tx.insert(t.variants).values({
            id: newId(), viewId, condition: r.condition, width: r.width, height: r.height, bytes: r.bytes, contrast: r.contrast, file: renderFileName(r.sha256),
          }).run()
        }
      }
    })
    return id
  }
  catch (e) {
    await Promise.all(made.map(f => rm(f, { force: true })))
    if (e instanceof Error && /UNIQUE constraint failed: variants\.file/.test(e.message)) {
      throw new StoreRefused(ALREADY_STORED)
    }
    throw e
  }
}

/** Removes rendering files by their stored names (after the rows that named them are gone). */
export async function removeRenderFiles(uploadsDir: string, files: string[]) {
  const dir = rendersDir(uploadsDir)
  await Promise.all(files.filter(f => /^[a-f0-9]{64}\.webp$/.test(f)).map(f => rm(join(dir, f), { force: true })))
}
