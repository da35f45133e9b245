// Luminance and contrast of sRGB colours, as defined by W3C WCAG 2.2 ("relative luminance",
// "contrast ratio") and by vision science (Weber contrast of a target on its background).

/** Linearises one sRGB channel given in 0..1 (IEC 61966-2-1 transfer, WCAG 2.2 threshold 0.04045). */
export function srgbChannelToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
}

/** Inverse of srgbChannelToLinear: linear 0..1 to an sRGB-encoded value 0..1. */
export function linearChannelToSrgb(v: number): number {
  if (v <= 0) return 0
  if (v >= 1) return 1
  return v <= 0.0031308 ? v * 12.92 : 1.055 * v ** (1 / 2.4) - 0.055
}

/** Relative luminance (0..1) of an 8-bit sRGB colour, WCAG 2.2. */
export function relativeLuminance(r: number, g: number, b: number): number {
  return 0.2126 * srgbChannelToLinear(r / 255)
    + 0.7152 * srgbChannelToLinear(g / 255)
    + 0.0722 * srgbChannelToLinear(b / 255)
}

/** Relative luminance of already linearised channels (0..1). */
export function linearLuminance(r: number, g: number, b: number): number {
  return 0.2126 * r + 0.7152 * g + 0.0722 * b
}

/** WCAG 2.2 contrast ratio (1..21) of two relative luminances, in either order. */
export function wcagContrastRatio(l1: number, l2: number): number {
  const hi = Math.max(l1, l2)
  const lo = Math.min(l1, l2)
  return (hi + 0.05) / (lo + 0.05)
}

/** Weber contrast of a target luminance on a background luminance: negative for a dark target. */
export function weberContrast(target: number, background: number): number {
  if (!(background > 0)) throw new RangeError('Weber contrast needs a background luminance above 0')
  return (target - background) / background
}
