// A small anti-aliased polygon rasteriser for the project's own silhouettes: even-odd scanline
// fill on four sub-scanlines a pixel row, with exact horizontal coverage at span ends.

/** Points as [x0, y0, x1, y1, ...] in pixels, y down. */
export type Polygon = number[]

const SUBROWS = 4

export type FillRule = 'nonzero' | 'evenodd'

/**
 * Fills polygons into a coverage buffer (0..1 a pixel). With the nonzero rule and polygons of the
 * same orientation, overlapping polygons paint their exact union, so shared edges leave no seam.
 */
export function fillPolygons(coverage: Float32Array, width: number, height: number, polygons: Polygon[], rule: FillRule = 'nonzero'): void {
  const edges: number[] = []
  let minY = Infinity
  let maxY = -Infinity
  for (const polygon of polygons) {
    const count = polygon.length / 2
    if (count < 3) continue
    for (let i = 0; i < count; i++) {
      const j = (i + 1) % count
      const x0 = polygon[i * 2]!
      const y0 = polygon[i * 2 + 1]!
      const x1 = polygon[j * 2]!
      const y1 = polygon[j * 2 + 1]!
      if (y0 === y1) continue
      // Stored top to bottom with the winding direction the edge had.
      if (y0 < y1) edges.push(x0, y0, x1, y1, 1)
      else edges.push(x1, y1, x0, y0, -1)
      minY = Math.min(minY, y0, y1)
      maxY = Math.max(maxY, y0, y1)
    }
  }
  if (edges.length === 0) return
  const rowFrom = Math.max(0, Math.floor(minY))
  const rowTo = Math.min(height - 1, Math.ceil(maxY))
  const acc = new Float32Array(width)
  const xs: number[] = []
  const order: number[] = []
  const weight = 1 / SUBROWS
  const edgeCount = edges.length / 5

  for (let row = rowFrom; row <= rowTo; row++) {
    let touched = false
    let spanFrom = width
    let spanTo = -1
    for (let s = 0; s < SUBROWS; s++) {
      const sy = row + (s + 0.5) / SUBROWS
      xs.length = 0
      for (let e = 0; e < edgeCount; e++) {
        const k = e * 5
        const y0 = edges[k + 1]!
        const y1 = edges[k + 3]!
        // Half-open rule so a vertex on the scanline is counted once.
        if (sy < y0 || sy >= y1) continue
        const x0 = edges[k]!
        xs.push(x0 + (sy - y0) / (y1 - y0) * (edges[k + 2]! - x0), edges[k + 4]!)
      }
      if (xs.length < 4) continue
      order.length = 0
      for (let i = 0; i < xs.length / 2; i++) order.push(i)
      order.sort((a, b) => xs[a * 2]! - xs[b * 2]!)
      let winding = 0
      for (let q = 0; q < order.length; q++) {
        const before = winding
        winding = rule === 'nonzero' ? winding + xs[order[q]! * 2 + 1]! : winding ^ 1
        if (before !== 0 || winding === 0 || q + 1 >= order.length) continue
        // Inside from this crossing until the winding returns to zero.
        let end = q + 1
        let w = winding
        for (; end < order.length; end++) {
          w = rule === 'nonzero' ? w + xs[order[end]! * 2 + 1]! : w ^ 1
          if (w === 0) break
        }
        if (end >= order.length) break
        const a = Math.max(0, xs[order[q]! * 2]!)
        const b = Math.min(width, xs[order[end]! * 2]!)
        winding = 0
        q = end
        if (b <= a) continue
        touched = true
        const ia = Math.floor(a)
        const ib = Math.floor(b)
        if (ia < spanFrom) spanFrom = ia
        if (ib > spanTo) spanTo = Math.min(width - 1, ib)
        if (ia === ib) {
          acc[ia]! += (b - a) * weight
          continue
        }
        acc[ia]! += (ia + 1 - a) * weight
        for (let x = ia + 1; x < ib; x++) acc[x]! += weight
        if (ib < width) acc[ib]! += (b - ib) * weight
      }
    }
    if (!touched) continue
    const base = row * width
    for (let x = spanFrom; x <= spanTo; x++) {
      const v = acc[x]! > 1 ? 1 : acc[x]!
      if (v > coverage[base + x]!) coverage[base + x] = v
      acc[x] = 0
    }
  }
}

/** Fills one polygon with the even-odd rule (see fillPolygons). */
export function fillPolygon(coverage: Float32Array, width: number, height: number, polygon: Polygon): void {
  fillPolygons(coverage, width, height, [polygon], 'evenodd')
}

/** Convex hull of 2D points [x0, y0, ...] (monotone chain), counter-clockwise, as a polygon. */
export function convexHull(points: number[]): Polygon {
  const n = points.length / 2
  const order = Array.from({ length: n }, (_, i) => i)
  order.sort((a, b) => points[a * 2]! - points[b * 2]! || points[a * 2 + 1]! - points[b * 2 + 1]!)
  const cross = (o: number, a: number, b: number) =>
    (points[a * 2]! - points[o * 2]!) * (points[b * 2 + 1]! - points[o * 2 + 1]!)
    - (points[a * 2 + 1]! - points[o * 2 + 1]!) * (points[b * 2]! - points[o * 2]!)
  const lower: number[] = []
  for (const i of order) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, i) <= 0) lower.pop()
    lower.push(i)
  }
  const upper: number[] = []
  for (let k = order.length - 1; k >= 0; k--) {
    const i = order[k]!
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, i) <= 0) upper.pop()
    upper.push(i)
  }
  lower.pop()
  upper.pop()
  const hull: Polygon = []
  for (const i of [...lower, ...upper]) hull.push(points[i * 2]!, points[i * 2 + 1]!)
  return hull
}
