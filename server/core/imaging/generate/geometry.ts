// Solid parts as convex point sets in metres (x forward, y to port, z up), seen along an aspect
// by orthographic projection: the silhouette of a convex part is the hull of its projected points.
import type { Aspect } from '../../../../shared/utils/conditions'
import { convexHull, type Polygon } from './raster'

export type Vec3 = readonly [number, number, number]
/** A convex solid, given by its corner points. */
export type Part = Vec3[]

const QUARTER = Math.SQRT1_2

/** Screen coordinates (u to the right, v up) of a point seen from an aspect. */
export function project(p: Vec3, aspect: Aspect): [number, number] {
  const [x, y, z] = p
  switch (aspect) {
    case 'beam': return [x, z]
    case 'head-on': return [y, z]
    case 'tail-on': return [-y, z]
    case 'bow-quarter': return [QUARTER * (x + y), z]
    case 'stern-quarter': return [QUARTER * (x - y), z]
    case 'plan': return [-y, x]
    case 'belly': return [y, x]
  }
}

/** Each part's outline on screen, v up. */
export function outlines(parts: Part[], aspect: Aspect): Polygon[] {
  return parts.map((part) => {
    const flat: number[] = []
    for (const p of part) flat.push(...project(p, aspect))
    return convexHull(flat)
  }).filter(polygon => polygon.length >= 6)
}

/** Box from its centre and full sizes. */
export function box(cx: number, cy: number, cz: number, lx: number, ly: number, lz: number): Part {
  const points: Vec3[] = []
  for (const dx of [-0.5, 0.5]) {
    for (const dy of [-0.5, 0.5]) {
      for (const dz of [-0.5, 0.5]) points.push([cx + dx * lx, cy + dy * ly, cz + dz * lz])
    }
  }
  return points
}

/** A ring of points around an axis along x, at station x, centre (y, z), radius r. */
export function ringX(x: number, y: number, z: number, r: number, sides = 16): Vec3[] {
  const out: Vec3[] = []
  for (let k = 0; k < sides; k++) {
    const a = (k / sides) * Math.PI * 2
    out.push([x, y + r * Math.cos(a), z + r * Math.sin(a)])
  }
  return out
}

/** Body of revolution along x: frustum parts between consecutive stations. */
export function bodyX(stations: { x: number, z: number, r: number }[], y = 0): Part[] {
  const parts: Part[] = []
  for (let i = 0; i + 1 < stations.length; i++) {
    const a = stations[i]!
    const b = stations[i + 1]!
    parts.push([...ringX(a.x, y, a.z, Math.max(a.r, 0.001)), ...ringX(b.x, y, b.z, Math.max(b.r, 0.001))])
  }
  return parts
}

/** A flat surface of thickness t from its outline in (a, b) coordinates mapped to 3D. */
export function slab(outline: [number, number][], t: number, place: (a: number, b: number, d: number) => Vec3): Part {
  const points: Vec3[] = []
  for (const [a, b] of outline) {
    points.push(place(a, b, -t / 2), place(a, b, t / 2))
  }
  return points
}
