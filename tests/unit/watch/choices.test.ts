import { Buffer } from 'node:buffer'
import { randomBytes } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { makeChoiceIds, pickChoices, sharedFeatureCount } from '../../../server/core/watch/choices'
import type { ChoiceType } from '../../../server/core/watch/choices'
import { seededRng } from '../../../server/core/watch/rng'

// Invented target types.
const t = (id: string, category: string, features: Record<string, string> = {}): ChoiceType => ({ id, name: `Name ${id}`, category, features })
const correct = t('k', 'aircraft', { wings: 'swept low', engines: 'two under wing', tail: 'high t' })
const candidates = [
  t('a1', 'aircraft', { wings: 'straight high', engines: 'one nose', tail: 'conventional' }),
  t('a2', 'aircraft', { wings: 'swept low', engines: 'two under wing', tail: 'conventional' }),
  t('a3', 'aircraft', { wings: 'delta', engines: 'one tail', tail: 'none' }),
  t('a4', 'aircraft', { wings: 'swept mid', engines: 'four under wing', tail: 'high t' }),
  t('a5', 'aircraft', { wings: 'straight', engines: 'two nacelles', tail: 'twin' }),
  t('a6', 'aircraft', { wings: 'straight low', engines: 'none', tail: 'v' }),
  t('v1', 'vessel', { hull: 'long' }),
  t('v2', 'vessel', { hull: 'short' }),
]

describe('pickChoices (product.md, The drill 5)', () => {
  it('four choices by default, the right one exactly once, no duplicates, same category only', () => {
    for (let seed = 0; seed < 100; seed++) {
      const out = pickChoices({ correct, candidates: [...candidates, candidates[0]!, correct], rng: seededRng(seed) })
      expect(out).toHaveLength(4)
      expect(out.filter(c => c.typeId === 'k')).toHaveLength(1)
      expect(new Set(out.map(c => c.typeId)).size).toBe(4)
      expect(out.every(c => c.typeId.startsWith('a') || c.typeId === 'k')).toBe(true)
      expect(out.find(c => c.typeId === 'k')!.label).toBe('Name k')
    }
  })

  it('min(count, available) when the category is small', () => {
    const vessel = t('v0', 'vessel')
    expect(pickChoices({ correct: vessel, candidates, rng: seededRng(1) })).toHaveLength(3)
    expect(pickChoices({ correct, candidates, count: 2, rng: seededRng(1) })).toHaveLength(2)
  })

  it('the crew\'s most frequent confusions first, by count, then look-alikes', () => {
    const crewConfusions = new Map([['a6', 9], ['a3', 4], ['v1', 50]])
    for (let seed = 0; seed < 30; seed++) {
      const out = pickChoices({ correct, candidates, lookAlikeIds: ['a5', 'a1'], crewConfusions, count: 3, rng: seededRng(seed) })
      expect(new Set(out.map(c => c.typeId))).toEqual(new Set(['k', 'a6', 'a3']))
      const withLookAlike = pickChoices({ correct, candidates, lookAlikeIds: ['a5'], crewConfusions, count: 4, rng: seededRng(seed) })
      expect(new Set(withLookAlike.map(c => c.typeId))).toEqual(new Set(['k', 'a6', 'a3', 'a5']))
    }
  })

  it('look-alikes are preferred over shared features', () => {
    for (let seed = 0; seed < 30; seed++) {
      const out = pickChoices({ correct, candidates, lookAlikeIds: ['a3', 'a5', 'a6'], rng: seededRng(seed) })
      expect(new Set(out.map(c => c.typeId))).toEqual(new Set(['k', 'a3', 'a5', 'a6']))
    }
  })

  it('then by shared feature words', () => {
    expect(sharedFeatureCount(correct.features, candidates[1]!.features)).toBe(5)
    expect(sharedFeatureCount(correct.features, candidates[3]!.features)).toBe(5)
    expect(sharedFeatureCount(['swept wings'], ['swept', 'low'])).toBe(1)
    for (let seed = 0; seed < 30; seed++) {
      const out = pickChoices({ correct, candidates, count: 3, rng: seededRng(seed) })
      expect(new Set(out.map(c => c.typeId))).toEqual(new Set(['k', 'a2', 'a4']))
    }
  })

  it('deterministic with a seed; Fisher–Yates puts the right one in every place about equally often', () => {
    expect(pickChoices({ correct, candidates, rng: seededRng(42) })).toEqual(pickChoices({ correct, candidates, rng: seededRng(42) }))
    const places = [0, 0, 0, 0]
    for (let seed = 0; seed < 2000; seed++) {
      places[pickChoices({ correct, candidates, rng: seededRng(seed) }).findIndex(c => c.typeId === 'k')]! += 1
    }
    // binomial(2000, 1/4): mean 500, sd ≈ 19.4; ±5 sd
    for (const n of places) expect(Math.abs(n - 500)).toBeLessThan(100)
  })
})

describe('makeChoiceIds', () => {
  it('gives distinct, URL-safe ids (node:crypto randomBytes)', () => {
    const ids = makeChoiceIds(4, randomBytes)
    expect(new Set(ids).size).toBe(4)
    for (const id of ids) expect(id).toMatch(/^[\w-]{22}$/)
    expect(makeChoiceIds(4, randomBytes)).not.toEqual(ids)
  })

  it('an id is the random bytes and nothing else (RFC 4648 base64url, decoded by node:buffer)', () => {
    let k = 0
    const bytes = (size: number) => Uint8Array.from({ length: size }, (_, i) => (i * 37 + k++ * 101) & 255)
    const ids = makeChoiceIds(3, bytes)
    k = 0
    for (const id of ids) expect(new Uint8Array(Buffer.from(id, 'base64url'))).toEqual(bytes(16))
  })

  it('refuses a byte source that repeats itself', () => {
    expect(() => makeChoiceIds(2, () => new Uint8Array(16))).toThrow()
  })
})
