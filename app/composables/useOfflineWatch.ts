// The phone's copy of the open watch and its calls waiting to sync, in IndexedDB (idb).
// Records carry the person's id, so a shared phone never sends one person's calls as another's.
import { openDB } from 'idb'
import type { DBSchema, IDBPDatabase } from 'idb'
import type { CallResult, IssuedSighting, IssuedWatch, WatchPack } from '#shared/types/watch'
import type { CallInput } from '#shared/schemas/watch'

// A result as the page shows it: graded on the phone until the server's answer replaces it.
export interface ShownResult extends CallResult {
  // graded on the phone, the server has not answered yet
  local?: boolean
  // the server refused the call (its reason)
  refused?: string
  // the server's stored answer came from another device
  otherDevice?: boolean
}

export interface StoredWatch {
  id: string
  userId: string
  watch: IssuedWatch
  pack: WatchPack | null
  // re-shows and copies of voided sightings issued after the pack
  extra: IssuedSighting[]
  // sighting ids still to show, in order
  left: string[]
  results: ShownResult[]
  voided: number
  savedAt: number
  // introductions already read (absent in watches stored before introductions)
  introsSeen?: string[]
}

export interface QueuedCall {
  key?: number
  userId: string
  watchId: string
  sightingId: string
  body: CallInput
  status: 'waiting' | 'refused'
  reason?: string
  queuedAt: number
}

interface GlintPhoneDb extends DBSchema {
  watches: { key: string, value: StoredWatch, indexes: { byUser: string } }
  queue: { key: number, value: QueuedCall, indexes: { byUser: string } }
}

let dbPromise: Promise<IDBPDatabase<GlintPhoneDb>> | null = null

function db() {
  dbPromise ??= openDB<GlintPhoneDb>('glint-phone', 1, {
    upgrade(d) {
      d.createObjectStore('watches', { keyPath: 'id' }).createIndex('byUser', 'userId')
      d.createObjectStore('queue', { keyPath: 'key', autoIncrement: true }).createIndex('byUser', 'userId')
    },
  })
  return dbPromise
}

// Plain copies: IndexedDB cannot clone Vue proxies.
const plain = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T

export const offlineWatch = {
  async save(w: StoredWatch) {
    await (await db()).put('watches', plain(w))
  },
  async get(id: string) {
    return (await db()).get('watches', id)
  },
  /** The person's most recently saved watch. */
  async latest(userId: string) {
    const all = await (await db()).getAllFromIndex('watches', 'byUser', userId)
    return all.sort((a, b) => b.savedAt - a.savedAt)[0] ?? null
  },
  async enqueue(c: QueuedCall) {
    return (await db()).add('queue', plain(c))
  },
  /** The person's queued calls in the order they were made. */
  async queued(userId: string) {
    const all = await (await db()).getAllFromIndex('queue', 'byUser', userId)
    return all.sort((a, b) => a.key! - b.key!)
  },
  async update(c: QueuedCall) {
    await (await db()).put('queue', plain(c))
  },
  async remove(key: number) {
    await (await db()).delete('queue', key)
  },
  /** At sign-out: every stored watch and pack (they hold answers) goes. Calls still waiting to
   *  sync stay, under their person's id, and are sent when that person signs in again. */
  async forgetWatches() {
    await (await db()).clear('watches')
  },
}

// The service worker's runtime caches (nuxt.config.ts, pwa.workbox.runtimeCaching): pages as the
// person saw them, and the images of their watches.
const PERSONAL_CACHES = ['glint-pages', 'glint-watch-images']

/** Sign-out on a shared phone: drops what the next person could read of this one. */
export async function forgetPersonalData() {
  if (!import.meta.client) return
  const cleared: Promise<unknown>[] = [offlineWatch.forgetWatches().catch(() => {})]
  if ('caches' in window) cleared.push(...PERSONAL_CACHES.map(name => caches.delete(name).catch(() => false)))
  await Promise.all(cleared)
}

/** True when a $fetch failed without an answer from the server (no connection, aborted). */
export function isNetworkFailure(e: unknown) {
  const err = e as { statusCode?: number, response?: unknown }
  return err?.statusCode === undefined && err?.response === undefined
}
