// Aircraft built from convex parts: fuselage, wings, engines and tail surfaces.
import { bodyX, box, type Part, ringX, slab, type Vec3 } from './geometry'

export type WingPlan = 'straight' | 'swept' | 'delta' | 'tapered'
export type WingPosition = 'high' | 'mid' | 'low'
export type EnginePlace = 'wing-pods' | 'tail' | 'nose-prop' | 'fuselage'
export type TailShape = 'conventional' | 't-tail' | 'twin-fin' | 'v-tail' | 'fin-only'

export interface AircraftParams {
  kind: 'aircraft'
  /** metres, nose to tail */
  fuselageLength: number
  /** metres, largest diameter */
  fuselageWidth: number
  /** metres, wing tip to wing tip */
  span: number
  wingPlan: WingPlan
  /** degrees, leading-edge sweep */
  sweep: number
  wingPosition: WingPosition
  /** metres */
  wingRootChord: number
  /** share of the fuselage length from the nose to the wing root's leading edge */
  wingStation: number
  /** degrees, wing tips up */
  dihedral: number
  engines: { count: number, place: EnginePlace }
  tail: TailShape
  /** metres above the fuselage top */
  finHeight: number
  /** metres, tip to tip of the horizontal tail */
  tailSpan: number
  /** share of the fuselage length taken by the nose taper */
  noseLength?: number
  /** round (transport) or pointed (fast jet) nose, default round */
  nose?: 'round' | 'pointed'
  /** a bubble canopy on top of the forward fuselage */
  canopy?: boolean
}

function tipChordShare(plan: WingPlan): number {
  switch (plan) {
    case 'straight': return 0.9
    case 'tapered': return 0.45
    case 'swept': return 0.32
    case 'delta': return 0.06
  }
}

export function aircraftParts(p: AircraftParams): Part[] {
  const parts: Part[] = []
  const L = p.fuselageLength
  const R = p.fuselageWidth / 2
  const nose = L / 2
  const tail = -L / 2
  const noseLen = (p.noseLength ?? 0.16) * L
  const coneLen = 0.3 * L
  const upsweep = 0.35 * R

  // Fuselage: rounded nose, parallel body, tail cone rising to the fin.
  const stations: { x: number, z: number, r: number }[] = []
  for (let k = 0; k <= 6; k++) {
    const s = k / 6
    const r = p.nose === 'pointed' ? R * Math.max(0.04, s ** 0.8) : R * Math.sqrt(Math.max(0.02, 1 - (1 - s) ** 2))
    stations.push({ x: nose - noseLen * s, z: -0.1 * R * (1 - s), r })
  }
  for (let k = 1; k <= 5; k++) {
    const s = k / 5
    stations.push({ x: tail + coneLen * (1 - s), z: upsweep * s ** 1.5 * 0.6, r: R * (1 - 0.72 * s ** 1.2) })
  }
  stations.sort((a, b) => b.x - a.x)
  parts.push(...bodyX(stations))
  if (p.canopy) {
    const front = nose - noseLen * 0.85
    const len = 0.2 * L
    parts.push(...bodyX([
      { x: front, z: 0.55 * R, r: 0.08 * R },
      { x: front - 0.3 * len, z: 0.62 * R, r: 0.5 * R },
      { x: front - 0.65 * len, z: 0.6 * R, r: 0.48 * R },
      { x: front - len, z: 0.5 * R, r: 0.1 * R },
    ]))
  }
  const tailTopZ = upsweep * 0.6 + R * 0.28

  // Wings.
  const semi = p.span / 2
  const cr = p.wingRootChord
  const tan = Math.tan((p.sweep * Math.PI) / 180)
  const rootLE = nose - p.wingStation * L
  let tipLE = rootLE - semi * tan
  let ct = cr * tipChordShare(p.wingPlan)
  if (p.wingPlan === 'delta') {
    // A delta keeps a straight trailing edge: the tip chord is what the sweep leaves.
    ct = Math.max(0.05 * cr, cr - semi * tan)
    tipLE = rootLE - cr + ct
  }
  const wingZ = p.wingPosition === 'high' ? 0.75 * R : p.wingPosition === 'low' ? -0.7 * R : 0
  const dih = Math.tan((p.dihedral * Math.PI) / 180)
  const thick = 0.1 * cr
  const wingAt = (side: 1 | -1) => slab(
    [[rootLE, 0], [rootLE - cr, 0], [tipLE - ct, semi], [tipLE, semi]],
    thick,
    (a, b, d) => [a, side * b, wingZ + b * dih + d * (1 - 0.6 * b / semi)] as Vec3,
  )
  parts.push(wingAt(1), wingAt(-1))

  // Engines.
  const count = Math.max(0, Math.round(p.engines.count))
  const podD = Math.max(0.9, 0.42 * p.fuselageWidth)
  const podLen = Math.max(2.2, 0.14 * L)
  if (p.engines.place === 'wing-pods' && count > 0) {
    const perSide = Math.max(1, Math.ceil(count / 2))
    for (let k = 0; k < perSide; k++) {
      const y = semi * (perSide === 1 ? 0.34 : 0.26 + 0.34 * k / (perSide - 1))
      const le = rootLE - (y / semi) * (rootLE - tipLE)
      const z = wingZ + y * dih - (p.wingPosition === 'high' ? 0.2 * podD : 0.6 * podD)
      for (const side of [1, -1]) {
        if (count % 2 === 1 && perSide * 2 > count && k === perSide - 1 && side === -1) continue
        parts.push(...bodyX([
          { x: le + 0.45 * podLen, z, r: podD * 0.42 },
          { x: le + 0.3 * podLen, z, r: podD * 0.5 },
          { x: le - 0.55 * podLen, z, r: podD * 0.34 },
        ], side * y))
      }
    }
  }
  else if (p.engines.place === 'tail' && count > 0) {
    const y = R + 0.55 * podD
    const x0 = tail + coneLen * 0.95
    const sides = count >= 2 ? [1, -1] : []
    for (const side of sides) {
      parts.push(...bodyX([
        { x: x0 + 0.1 * podLen, z: 0.3 * R, r: podD * 0.45 },
        { x: x0 - 0.9 * podLen, z: 0.3 * R, r: podD * 0.36 },
      ], side * y))
      parts.push(box(x0 - 0.45 * podLen, side * (R + 0.2 * podD) / 2 + side * 0.2 * R, 0.3 * R, 0.4 * podLen, R, 0.12 * podD))
    }
    if (count % 2 === 1) {
      parts.push(...bodyX([
        { x: x0 + 0.1 * podLen, z: tailTopZ + 0.4 * podD, r: podD * 0.45 },
        { x: x0 - 0.9 * podLen, z: tailTopZ + 0.4 * podD, r: podD * 0.36 },
      ]))
    }
  }
  else if (p.engines.place === 'nose-prop') {
    const propD = Math.max(1.8, 1.5 * p.fuselageWidth)
    parts.push(...bodyX([{ x: nose + 0.55 * R, z: -0.1 * R, r: 0.05 * R }, { x: nose - 0.05 * R, z: -0.1 * R, r: 0.35 * R }]))
    for (const angle of [20, 110]) {
      const a = (angle * Math.PI) / 180
      const c = Math.cos(a) * propD / 2
      const s = Math.sin(a) * propD / 2
      const w = 0.05 * propD
      parts.push([
        [nose + 0.1 * R, c + w, -0.1 * R + s], [nose + 0.1 * R, -c + w, -0.1 * R - s],
        [nose + 0.1 * R, c - w, -0.1 * R + s], [nose + 0.1 * R, -c - w, -0.1 * R - s],
        [nose + 0.02 * R, c, -0.1 * R + s], [nose + 0.02 * R, -c, -0.1 * R - s],
      ])
    }
  }
  else if (p.engines.place === 'fuselage') {
    // Intakes beside the fuselage and one nozzle per engine at the tail.
    const iy = R + 0.18 * R
    const intakeLen = 0.3 * L
    for (const side of [1, -1]) {
      parts.push([
        ...ringX(rootLE + 0.5 * cr, side * iy, -0.1 * R, 0.32 * R, 8),
        ...ringX(rootLE + 0.5 * cr - intakeLen, side * iy * 0.85, -0.1 * R, 0.38 * R, 8),
      ])
    }
    const nozzles = Math.max(1, count)
    for (let k = 0; k < nozzles; k++) {
      const y = nozzles === 1 ? 0 : (k - (nozzles - 1) / 2) * 0.9 * R
      parts.push([...ringX(tail + 0.08 * L, y, 0.1 * R, 0.45 * R, 10), ...ringX(tail - 0.02 * L, y, 0.1 * R, 0.4 * R, 10)])
    }
  }

  // Tail surfaces.
  const finRoot = 0.2 * L
  const finTan = Math.tan((40 * Math.PI) / 180)
  const h = p.finHeight
  const finOutline: [number, number][] = [
    [tail + finRoot, 0], [tail - 0.02 * L, 0], [tail - 0.02 * L - h * finTan * 0.55, h], [tail + finRoot * 0.45 - h * finTan * 0.8, h],
  ]
  const finThick = 0.06 * finRoot
  const stabSemi = p.tailSpan / 2
  const stabRoot = 0.15 * L
  const stabTan = Math.tan((Math.min(45, Math.max(8, p.sweep * 0.9)) * Math.PI) / 180)
  const stab = (z: number, cant = 0, semiSpan = stabSemi) => ([1, -1] as const).map(side => slab(
    [[tail + stabRoot, 0], [tail, 0], [tail - semiSpan * stabTan * 0.6, semiSpan], [tail + stabRoot * 0.4 - semiSpan * stabTan, semiSpan]],
    0.08 * stabRoot,
    (a, b, d) => [a, side * (b * Math.cos(cant) + 0.2 * R), z + b * Math.sin(cant) + d] as Vec3,
  ))
  const fin = (y: number, cant: number) => slab(finOutline, finThick, (a, b, d) => [a, y + b * Math.sin(cant) + d, tailTopZ + b * Math.cos(cant)] as Vec3)

  switch (p.tail) {
    case 'conventional':
      parts.push(fin(0, 0), ...stab(upsweep * 0.6))
      break
    case 't-tail':
      parts.push(fin(0, 0), ...stab(tailTopZ + h * 0.97))
      break
    case 'twin-fin':
      parts.push(fin(0.8 * R, 0.25), fin(-0.8 * R, -0.25), ...stab(upsweep * 0.4))
      break
    case 'v-tail':
      // Two canted surfaces do the work of fin and tailplane, so they span more than either.
      parts.push(...stab(tailTopZ - 0.2 * R, (38 * Math.PI) / 180, Math.max(stabSemi, 1.3 * h)))
      break
    case 'fin-only':
      parts.push(fin(0, 0))
      break
  }
  return parts
}
