// Vessels built from convex parts: hull, superstructure blocks, masts, funnels and guns.
import { box, type Part, type Vec3 } from './geometry'

export type BowShape = 'straight' | 'raked' | 'clipper'
export type SternShape = 'transom' | 'cruiser'
export type MastKind = 'pole' | 'lattice' | 'tripod'
export type GunSize = 'small' | 'medium' | 'large'

export interface SuperstructureBlock {
  /** centre, as a share of the length from the bow (0) to the stern (1) */
  at: number
  /** metres */
  length: number
  /** metres above the deck, or above the block below */
  height: number
  /** share of the beam, default 0.8 */
  width?: number
  /** metres the top of the front face is set back */
  slope?: number
  /** stack on the block below at this place */
  stacked?: boolean
}

export interface VesselParams {
  kind: 'vessel'
  /** metres, overall */
  length: number
  /** metres, width */
  beam: number
  /** metres from waterline to deck amidships */
  freeboard: number
  /** metres the deck rises towards the bow */
  sheer: number
  bow: BowShape
  stern: SternShape
  blocks: SuperstructureBlock[]
  masts: { at: number, height: number, kind: MastKind }[]
  funnels: { at: number, height: number, length?: number, rake?: number }[]
  guns: { at: number, size: GunSize }[]
}

const GUNS: Record<GunSize, { length: number, width: number, height: number, barrel: number, bore: number }> = {
  small: { length: 2.6, width: 2.2, height: 1.6, barrel: 3.2, bore: 0.3 },
  medium: { length: 5.5, width: 4.2, height: 2.4, barrel: 6.5, bore: 0.45 },
  large: { length: 9, width: 7.5, height: 3.4, barrel: 12, bore: 0.8 },
}

export function vesselParts(p: VesselParams): Part[] {
  const parts: Part[] = []
  const L = p.length
  const B = p.beam
  const overhang = p.bow === 'straight' ? 0.006 * L : p.bow === 'raked' ? 0.05 * L : 0.085 * L
  const sternOverhang = p.stern === 'cruiser' ? 0.03 * L : 0.006 * L
  const bowX = (h: number) => L / 2 - overhang * (1 - (p.bow === 'clipper' ? 1 - (1 - h) ** 2 : h))
  const sternX = (h: number) => -L / 2 + sternOverhang * (1 - h)
  const deckAt = (s: number) => p.freeboard + p.sheer * Math.max(0, (s - 0.45) / 0.55) ** 2
  const halfBreadth = (s: number, h: number) => {
    const bowTaper = s > 0.62 ? Math.max(0, (1 - s) / 0.38) ** 0.7 : 1
    const sternTaper = p.stern === 'transom' ? 0.82 + 0.18 * Math.min(1, s / 0.1) : Math.sqrt(Math.min(1, s / 0.1))
    return (B / 2) * (0.8 + 0.2 * h) * bowTaper * sternTaper
  }
  const hullPoint = (s: number, h: number, side: number): Vec3 => {
    const x = sternX(h) + s * (bowX(h) - sternX(h))
    return [x, side * halfBreadth(s, h), h * deckAt(s)]
  }
  // The hull as a grid of convex cells along its length and height.
  const along = 18
  const up = 3
  for (let i = 0; i < along; i++) {
    for (let k = 0; k < up; k++) {
      const cell: Vec3[] = []
      for (const s of [i / along, (i + 1) / along]) {
        for (const h of [k / up, (k + 1) / up]) cell.push(hullPoint(s, h, 1), hullPoint(s, h, -1))
      }
      parts.push(cell)
    }
  }

  // Where the top of what stands on the deck is, at a share s of the length from the bow.
  const xAt = (at: number) => L / 2 - at * L
  const tops: { from: number, to: number, z: number }[] = []
  const topAt = (at: number) => {
    const x = xAt(at)
    let z = deckAt(1 - at)
    for (const t of tops) {
      if (x <= t.from && x >= t.to && t.z > z) z = t.z
    }
    return z
  }

  for (const block of p.blocks) {
    const cx = xAt(block.at)
    const base = block.stacked ? topAt(block.at) : deckAt(1 - block.at)
    const w = (block.width ?? 0.8) * B
    const slope = block.slope ?? 0
    const front = cx + block.length / 2
    const back = cx - block.length / 2
    const points: Vec3[] = []
    for (const y of [-w / 2, w / 2]) {
      points.push([front, y, base], [back, y, base], [front - slope, y, base + block.height], [back, y, base + block.height])
    }
    parts.push(points)
    tops.push({ from: front, to: back, z: base + block.height })
  }

  for (const funnel of p.funnels) {
    const cx = xAt(funnel.at)
    const base = topAt(funnel.at)
    const fl = funnel.length ?? 0.07 * L
    const lean = Math.tan(((funnel.rake ?? 8) * Math.PI) / 180) * funnel.height
    const w = Math.min(0.45 * B, 0.7 * fl)
    const points: Vec3[] = []
    for (const y of [-w / 2, w / 2]) {
      points.push([cx + fl / 2, y, base - 0.2], [cx - fl / 2, y, base - 0.2], [cx + fl / 2 - lean, y, base + funnel.height], [cx - fl / 2 - lean, y, base + funnel.height])
    }
    parts.push(points)
  }

  for (const mast of p.masts) {
    const cx = xAt(mast.at)
    const base = topAt(mast.at)
    const h = mast.height
    if (mast.kind === 'pole') {
      parts.push(box(cx, 0, base + h / 2, 0.5, 0.5, h))
      parts.push(box(cx, 0, base + 0.72 * h, 0.35, 0.55 * B, 0.3))
    }
    else if (mast.kind === 'lattice') {
      const foot = Math.max(2, 0.09 * h * 2.2)
      const points: Vec3[] = []
      for (const dx of [-1, 1]) {
        for (const dy of [-1, 1]) points.push([cx + dx * foot / 2, dy * foot / 2, base], [cx + dx * 0.3, dy * 0.3, base + h * 0.85])
      }
      parts.push(points)
      parts.push(box(cx, 0, base + 0.925 * h, 0.35, 0.35, 0.15 * h))
      parts.push(box(cx, 0, base + 0.7 * h, 0.4, 0.6 * B, 0.35))
      parts.push(box(cx, 0, base + 0.55 * h, 1.6, 0.4 * B, 0.3))
    }
    else {
      const spread = 0.28 * h
      const leg = (fx: number, fy: number): Part => [
        [cx + fx - 0.25, fy - 0.25, base], [cx + fx + 0.25, fy + 0.25, base],
        [cx - 0.25, -0.25, base + 0.8 * h], [cx + 0.25, 0.25, base + 0.8 * h],
      ]
      parts.push(box(cx, 0, base + h / 2, 0.6, 0.6, h), leg(-spread, spread * 0.6), leg(-spread, -spread * 0.6))
      parts.push(box(cx, 0, base + 0.8 * h, 0.4, 0.5 * B, 0.35))
      parts.push(box(cx, 0, base + 0.8 * h + 0.9, 2.2, 2.2, 1.8))
    }
  }

  for (const gun of p.guns) {
    const g = GUNS[gun.size]
    const cx = xAt(gun.at)
    const base = topAt(gun.at)
    const facing = gun.at < 0.5 ? 1 : -1
    parts.push(box(cx, 0, base + g.height / 2, g.length, g.width, g.height))
    const bz = base + g.height * 0.55
    const start = cx + facing * g.length * 0.3
    const end = start + facing * g.barrel
    parts.push([
      [start, -g.bore / 2, bz - g.bore / 2], [start, g.bore / 2, bz - g.bore / 2], [start, -g.bore / 2, bz + g.bore / 2], [start, g.bore / 2, bz + g.bore / 2],
      [end, -g.bore / 2, bz - g.bore / 2 + 0.08 * g.barrel], [end, g.bore / 2, bz - g.bore / 2 + 0.08 * g.barrel],
      [end, -g.bore / 2, bz + g.bore / 2 + 0.08 * g.barrel], [end, g.bore / 2, bz + g.bore / 2 + 0.08 * g.barrel],
    ])
  }
  return parts
}
