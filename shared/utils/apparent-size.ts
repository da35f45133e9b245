// Apparent size of a target on the phone: visual angle by plane geometry, magnified by
// the binoculars, converted to CSS pixels with the CSS reference pixel.

// Visual angle of the CSS reference pixel: one pixel of a 96 dpi screen seen from 28 in
// (W3C CSS Values and Units Level 3, "reference pixel").
export const CSS_REFERENCE_PIXEL_DEG = 0.0213

// Standard lookout binoculars are 7x50 (common practice, no source).
export const BINOCULAR_MAGNIFICATION = 7

const RAD_TO_DEG = 180 / Math.PI

function assertPositive(name: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a finite number > 0, got ${value}`)
}

function assertMagnification(magnification: number): void {
  if (!Number.isFinite(magnification) || magnification < 1) {
    throw new RangeError(`magnification must be >= 1, got ${magnification}`)
  }
}

/** Naked-eye visual angle in degrees: θ = 2·atan(size / (2·range)) (plane geometry). */
export function apparentAngleDeg(sizeM: number, rangeM: number): number {
  assertPositive('sizeM', sizeM)
  assertPositive('rangeM', rangeM)
  return 2 * Math.atan(sizeM / (2 * rangeM)) * RAD_TO_DEG
}

/** Visual angle through an instrument: the naked-eye angle times its magnification (default 7x). */
export function magnifiedAngleDeg(sizeM: number, rangeM: number, magnification: number = BINOCULAR_MAGNIFICATION): number {
  assertMagnification(magnification)
  return apparentAngleDeg(sizeM, rangeM) * magnification
}

/** Apparent size in CSS pixels; pass magnification 1 for the naked eye (default 7x binoculars). */
export function apparentPx(sizeM: number, rangeM: number, magnification: number = BINOCULAR_MAGNIFICATION): number {
  return magnifiedAngleDeg(sizeM, rangeM, magnification) / CSS_REFERENCE_PIXEL_DEG
}

/** The range at which a target of sizeM shows px CSS pixels wide: the inverse of apparentPx. */
export function rangeForPx(sizeM: number, px: number, magnification: number = BINOCULAR_MAGNIFICATION): number {
  assertPositive('sizeM', sizeM)
  assertPositive('px', px)
  assertMagnification(magnification)
  const nakedDeg = (px * CSS_REFERENCE_PIXEL_DEG) / magnification
  if (nakedDeg >= 180) throw new RangeError(`${px} px is wider than any visual angle`)
  return sizeM / (2 * Math.tan(nakedDeg / 2 / RAD_TO_DEG))
}

export const METRES_PER_NAUTICAL_MILE = 1852
export const METRES_PER_FOOT = 0.3048

/**
 * Distance to the horizon in nautical miles for an eye height in feet: d ≈ 1.17·√h
 * (Bowditch, The American Practical Navigator, 1995 and 2002 editions, chapter 22; includes refraction).
 */
export function horizonDistanceNm(heightFt: number): number {
  if (!Number.isFinite(heightFt) || heightFt < 0) throw new RangeError(`heightFt must be >= 0, got ${heightFt}`)
  return 1.17 * Math.sqrt(heightFt)
}

/** horizonDistanceNm for an eye height in metres, in metres. */
export function horizonDistanceM(heightM: number): number {
  return horizonDistanceNm(heightM / METRES_PER_FOOT) * METRES_PER_NAUTICAL_MILE
}
