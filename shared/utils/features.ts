// Key features in words, compared: what tells two target types apart (introductions, reveals).

export type FeatureMap = Readonly<Record<string, string>>

export interface FeatureDifference { feature: string, a: string | null, b: string | null }

const norm = (v: string) => v.trim().toLowerCase().replace(/\s+/g, ' ')

/**
 * The features on which two types differ, in the order of the first type's features, then the
 * second's own: a feature named by only one of them counts as a difference. Values are compared
 * without regard to case and spacing.
 */
export function featureDifferences(a: FeatureMap, b: FeatureMap): FeatureDifference[] {
  const out: FeatureDifference[] = []
  const keys = [...Object.keys(a), ...Object.keys(b).filter(k => !(k in a))]
  for (const k of keys) {
    const x = a[k] ?? null
    const y = b[k] ?? null
    if (x === null || y === null || norm(x) !== norm(y)) out.push({ feature: k, a: x, b: y })
  }
  return out
}
