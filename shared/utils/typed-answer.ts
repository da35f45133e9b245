// Typed answers: forgive case, spacing, hyphens, accents and small typos, but never
// credit a call that reads as another target type's name.
import { distance } from 'fastest-levenshtein'

export interface NamedType {
  id: string
  name: string
}

export interface TypedMatch {
  // the target type the typed text names, or null when it names none (or two equally)
  matchedId: string | null
  correct: boolean
}

/**
 * The comparison key of a name: diacritics removed (NFKD, combining marks dropped),
 * lower case, and only letters and digits kept, so "Sea-Hawk", "sea hawk" and
 * "Séahawk" all become "seahawk".
 */
export function normaliseName(name: string): string {
  return name
    .normalize('NFKD')
    .replace(/\p{M}/gu, '')
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]/gu, '')
}

/**
 * Typos forgiven for a name of this normalised length (design value, no source): none up to 3
 * characters, where one edit already makes another short name (a one-letter name must not
 * accept any one letter), 1 up to 5 characters, 2 above.
 */
export function typoTolerance(normalisedLength: number): number {
  if (normalisedLength <= 3) return 0
  return normalisedLength <= 5 ? 1 : 2
}

/**
 * Matches typed text against the deck's target type names (Levenshtein distance on
 * normalised names). The typed text names the single type it is nearest to, if within
 * that name's typo tolerance. A tie between two types names neither, so a call is never
 * credited when it is as close or closer to another type's name than to the right one;
 * an exact other name is always that other type.
 */
export function matchTypedAnswer(typed: string, names: readonly NamedType[], correctId: string): TypedMatch {
  const key = normaliseName(typed)
  if (key.length === 0) return { matchedId: null, correct: false }

  let best = Number.POSITIVE_INFINITY
  let bestIds: string[] = []
  for (const { id, name } of names) {
    const d = distance(key, normaliseName(name))
    if (d < best) {
      best = d
      bestIds = [id]
    }
    else if (d === best && !bestIds.includes(id)) {
      bestIds.push(id)
    }
  }
  if (bestIds.length !== 1) return { matchedId: null, correct: false }

  const matchedId = bestIds[0]!
  const matchedName = names.find(n => n.id === matchedId)!.name
  if (best > typoTolerance(normaliseName(matchedName).length)) return { matchedId: null, correct: false }
  return { matchedId, correct: matchedId === correctId }
}
