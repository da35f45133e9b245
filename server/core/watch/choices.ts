// Answer choices for a sighting: the right type and distractors a lookout could mistake
// for it, in an order and under ids that give nothing away.
import { Buffer } from 'node:buffer'
import { shuffled } from './rng'
import type { Rng } from './rng'

export type Features = Readonly<Record<string, string>> | readonly string[]

export interface ChoiceType {
  id: string
  name: string
  category: string
  features?: Features
}

export interface PickChoicesInput {
  correct: ChoiceType
  candidates: readonly ChoiceType[]
  // types the instructor marked as look-alikes of the correct one
  lookAlikeIds?: Iterable<string>
  // how often this crew called each type when the correct one was shown
  crewConfusions?: ReadonlyMap<string, number>
  // buttons in all, the right one included (deck setting, default 4)
  count?: number
  rng: Rng
}

export interface Choice {
  typeId: string
  label: string
}

export const DEFAULT_CHOICE_COUNT = 4

const STOP_WORDS = new Set(['a', 'an', 'and', 'the', 'of', 'on', 'in', 'at', 'to', 'with'])

function words(text: string): string[] {
  return text.toLowerCase().split(/[^\p{L}\p{N}]+/u).filter(w => w.length > 0 && !STOP_WORDS.has(w))
}

// Feature words as a set; with named features (wings: "...") a word counts only under its own feature.
function featureWords(features: Features | undefined): Set<string> {
  const out = new Set<string>()
  if (!features) return out
  if (Array.isArray(features)) {
    for (const f of features as readonly string[]) for (const w of words(f)) out.add(w)
  }
  else {
    for (const [key, value] of Object.entries(features as Readonly<Record<string, string>>)) {
      for (const w of words(String(value))) out.add(`${key.toLowerCase()}:${w}`)
    }
  }
  return out
}

/** How many feature words two types share (distinct words; named features compared key by key). */
export function sharedFeatureCount(a: Features | undefined, b: Features | undefined): number {
  const wa = featureWords(a)
  let n = 0
  for (const w of featureWords(b)) if (wa.has(w)) n++
  return n
}

/**
 * Picks min(count, 1 + distractors available) choices: the correct type plus distractors
 * of its category, ranked by (1) this crew's confusions, most often called first, (2) the
 * instructor's look-alikes, (3) shared feature words, (4) chance; then shuffled
 * (Fisher–Yates). Duplicate ids and duplicate labels are dropped.
 */
export function pickChoices(input: PickChoicesInput): Choice[] {
  const { correct, candidates, rng } = input
  const count = input.count ?? DEFAULT_CHOICE_COUNT
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be a whole number >= 1, got ${count}`)
  const lookAlikes = new Set(input.lookAlikeIds ?? [])
  const confusions = input.crewConfusions ?? new Map<string, number>()

  const seenIds = new Set([correct.id])
  const seenLabels = new Set([correct.name.trim().toLowerCase()])
  const pool: ChoiceType[] = []
  for (const c of candidates) {
    const label = c.name.trim().toLowerCase()
    if (c.category !== correct.category || seenIds.has(c.id) || seenLabels.has(label)) continue
    seenIds.add(c.id)
    seenLabels.add(label)
    pool.push(c)
  }

  // Shuffle first so that the stable sort breaks remaining ties at random.
  const ranked = shuffled(pool, rng)
    .map(c => ({
      c,
      confused: Math.max(0, confusions.get(c.id) ?? 0),
      lookAlike: lookAlikes.has(c.id) ? 1 : 0,
      shared: sharedFeatureCount(correct.features, c.features),
    }))
    .sort((x, y) => y.confused - x.confused || y.lookAlike - x.lookAlike || y.shared - x.shared)

  const picked = [correct, ...ranked.slice(0, count - 1).map(r => r.c)]
  return shuffled(picked, rng).map(t => ({ typeId: t.id, label: t.name }))
}

// 16 random bytes: 128 bits, as many as a version 4 UUID carries in all.
export const CHOICE_ID_BYTES = 16

/**
 * n distinct opaque choice ids from random bytes (e.g. node:crypto randomBytes): they carry
 * neither the position nor the type, so nothing before the call tells which is right.
 */
export function makeChoiceIds(n: number, randomBytes: (size: number) => Uint8Array): string[] {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`n must be a whole number >= 0, got ${n}`)
  const ids = new Set<string>()
  let attempts = 0
  while (ids.size < n) {
    if (++attempts > n * 8 + 8) throw new Error('randomBytes keeps repeating itself')
    const bytes = randomBytes(CHOICE_ID_BYTES)
    if (bytes.length < CHOICE_ID_BYTES) throw new RangeError(`randomBytes returned ${bytes.length} bytes, wanted ${CHOICE_ID_BYTES}`)
    ids.add(Buffer.from(bytes.subarray(0, CHOICE_ID_BYTES)).toString('base64url'))
  }
  return [...ids]
}
