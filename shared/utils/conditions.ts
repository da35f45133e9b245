// The lighting conditions a view is rendered under, and the aspects a view is tagged with
// (glossary of product.md).

export const CONDITIONS = ['backlit', 'sunlit', 'dark-cloud', 'white-cloud', 'haze', 'goggles'] as const
export type Condition = typeof CONDITIONS[number]

export const ASPECTS = ['head-on', 'tail-on', 'beam', 'plan', 'belly', 'bow-quarter', 'stern-quarter'] as const
export type Aspect = typeof ASPECTS[number]

export interface ConditionInfo {
  label: string
  description: string
}

export const CONDITION_INFO: Readonly<Record<Condition, ConditionInfo>> = {
  'backlit': { label: 'Backlit', description: 'Dark shape against bright sky near the sun.' },
  'sunlit': { label: 'Sunlit', description: 'Light shape lit by the sun against blue sky.' },
  'dark-cloud': { label: 'Dark cloud', description: 'Dark shape against dark cloud: little contrast.' },
  'white-cloud': { label: 'White cloud', description: 'Dark shape crossing a white cloud.' },
  'haze': { label: 'Haze', description: 'Washed out and soft-edged, seen through haze.' },
  'goggles': { label: 'Filter goggles', description: 'Whole scene dimmed, blue sky darkened by filter goggles.' },
}

// Easiest first. The two easy cases named by the trade come first (dark shape on white cloud,
// sunlit shape on blue sky); backlit keeps a strong contrast but sits near glare; haze lowers
// the contrast and softens the outline; the two hard cases named by the trade come last, dark
// cloud last of all because it has the lowest contrast (common practice, no source).
export const CONDITION_DIFFICULTY: readonly Condition[] = ['white-cloud', 'sunlit', 'backlit', 'haze', 'goggles', 'dark-cloud']

/** 0 for the easiest condition, CONDITIONS.length - 1 for the hardest. */
export function conditionDifficulty(condition: Condition): number {
  return CONDITION_DIFFICULTY.indexOf(condition)
}

/**
 * The range a rendering must fall in: Weber contrast C = (Lt - Lb) / Lb of the target's mean
 * relative luminance on the background's, and the background's mean relative luminance.
 */
export interface ContrastBand {
  min: number
  max: number
  background: { min: number, max: number }
}

// Bands: design values with no source, chosen from the physics of each scene: a near-black silhouette on bright sky or cloud
// gives C close to -1; a sunlit grey skin on blue sky is two to three times brighter than the sky;
// haze adds airlight to the target and pulls C towards 0; a dark target on dark cloud differs
// little; filter goggles cut blue light, so the sky darkens more than a grey target and the
// whole scene is dim.
export const CONTRAST_BANDS: Readonly<Record<Condition, ContrastBand>> = {
  'backlit': { min: -1, max: -0.8, background: { min: 0.55, max: 1 } },
  'sunlit': { min: 0.8, max: 3.5, background: { min: 0.1, max: 0.45 } },
  'dark-cloud': { min: -0.5, max: -0.15, background: { min: 0.02, max: 0.15 } },
  'white-cloud': { min: -1, max: -0.75, background: { min: 0.5, max: 1 } },
  'haze': { min: -0.6, max: -0.2, background: { min: 0.35, max: 0.9 } },
  'goggles': { min: -0.75, max: -0.3, background: { min: 0, max: 0.06 } },
}

export const ASPECT_LABELS: Readonly<Record<Aspect, string>> = {
  'head-on': 'Head-on',
  'tail-on': 'Tail-on',
  'beam': 'Beam (side)',
  'plan': 'Plan (top)',
  'belly': 'Belly',
  'bow-quarter': 'Bow quarter',
  'stern-quarter': 'Stern quarter',
}

export function isCondition(value: unknown): value is Condition {
  return typeof value === 'string' && (CONDITIONS as readonly string[]).includes(value)
}
