// The project's own silhouettes: black on transparent, drawn from a type's parameters.
import type { Aspect } from '../../../../shared/utils/conditions'
import { encodePng, type RgbaImage } from '../codecs'
import { aircraftParts, type AircraftParams } from './aircraft'
import { outlines, type Part } from './geometry'
import { fillPolygons } from './raster'
import { vesselParts, type VesselParams } from './vessel'

export type SilhouetteParams = AircraftParams | VesselParams
export type { AircraftParams } from './aircraft'
export type { VesselParams } from './vessel'

export interface DrawOptions {
  /** canvas width in pixels, default 1200 */
  width?: number
  /** canvas height in pixels, default 800 */
  height?: number
  /** empty border around the silhouette, as a share of the canvas, default 0.06 */
  margin?: number
}

export function partsOf(params: SilhouetteParams): Part[] {
  return params.kind === 'aircraft' ? aircraftParts(params) : vesselParts(params)
}

/** Draws the silhouette seen from an aspect, centred and scaled to fit the canvas. */
export function drawSilhouette(params: SilhouetteParams, aspect: Aspect, options: DrawOptions = {}): RgbaImage {
  const width = options.width ?? 1200
  const height = options.height ?? 800
  const margin = options.margin ?? 0.06
  const polygons = outlines(partsOf(params), aspect)
  let minU = Infinity
  let maxU = -Infinity
  let minV = Infinity
  let maxV = -Infinity
  for (const polygon of polygons) {
    for (let i = 0; i < polygon.length; i += 2) {
      minU = Math.min(minU, polygon[i]!)
      maxU = Math.max(maxU, polygon[i]!)
      minV = Math.min(minV, polygon[i + 1]!)
      maxV = Math.max(maxV, polygon[i + 1]!)
    }
  }
  const scale = Math.min(width * (1 - 2 * margin) / (maxU - minU), height * (1 - 2 * margin) / (maxV - minV))
  const offsetU = (width - (maxU - minU) * scale) / 2
  const offsetV = (height - (maxV - minV) * scale) / 2
  const coverage = new Float32Array(width * height)
  const pixels = polygons.map((polygon) => {
    const out: number[] = []
    for (let i = 0; i < polygon.length; i += 2) {
      out.push(offsetU + (polygon[i]! - minU) * scale, height - offsetV - (polygon[i + 1]! - minV) * scale)
    }
    return out
  })
  // Hulls all turn the same way, so the nonzero rule paints their union without seams.
  fillPolygons(coverage, width, height, pixels, 'nonzero')
  const data = new Uint8ClampedArray(width * height * 4)
  for (let i = 0; i < coverage.length; i++) data[i * 4 + 3] = Math.round(coverage[i]! * 255)
  return { data, width, height }
}

/** The silhouette as PNG bytes. */
export async function silhouettePng(params: SilhouetteParams, aspect: Aspect, options: DrawOptions = {}): Promise<Uint8Array> {
  return encodePng(drawSilhouette(params, aspect, options))
}
