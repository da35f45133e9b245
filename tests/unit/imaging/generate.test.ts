import { describe, expect, it } from 'vitest'
import { ASPECTS } from '../../../shared/utils/conditions'
import { decodeImage } from '../../../server/core/imaging/codecs'
import { DEMO_TARGET_TYPES, demoSilhouettes, demoTargetType, LOOK_ALIKE_PAIRS } from '../../../server/core/imaging/generate/catalogue'
import { drawSilhouette } from '../../../server/core/imaging/generate/index'
import { fillPolygon, fillPolygons } from '../../../server/core/imaging/generate/raster'
import { extractSilhouette, maskBounds } from '../../../server/core/imaging/mask'

function sum(a: Float32Array): number {
  let s = 0
  for (const v of a) s += v
  return s
}

describe('polygon fill', () => {
  it('covers the area of a triangle (plane geometry: half base times height)', () => {
    const c = new Float32Array(100 * 100)
    fillPolygon(c, 100, 100, [10.3, 10.7, 90.2, 10.7, 50.1, 70.9])
    expect(sum(c)).toBeCloseTo(0.5 * 79.9 * 60.2, -1)
  })

  it('leaves a hole where a polygon crosses itself twice under the even-odd rule, and fills a union without double counting', () => {
    const c = new Float32Array(40 * 40)
    // Outer square then inner square as one ring: even-odd leaves the inner square empty.
    fillPolygon(c, 40, 40, [0, 0, 40, 0, 40, 40, 0, 40, 0, 0, 10, 10, 10, 30, 30, 30, 30, 10, 10, 10])
    expect(sum(c)).toBeCloseTo(40 * 40 - 20 * 20, 0)
    const u = new Float32Array(40 * 40)
    fillPolygons(u, 40, 40, [[0, 0, 20, 0, 20, 20, 0, 20], [10, 0, 30, 0, 30, 20, 10, 20]])
    expect(sum(u)).toBeCloseTo(30 * 20, 0)
  })
})

describe('demo catalogue (invented)', () => {
  const aircraft = DEMO_TARGET_TYPES.filter(t => t.category === 'aircraft')
  const vessels = DEMO_TARGET_TYPES.filter(t => t.category === 'vessel')

  it('has at least 8 aircraft and 6 vessel types with unique names, all three affiliations and the features of the trade', () => {
    expect(aircraft.length).toBeGreaterThanOrEqual(8)
    expect(vessels.length).toBeGreaterThanOrEqual(6)
    expect(new Set(DEMO_TARGET_TYPES.map(t => t.name)).size).toBe(DEMO_TARGET_TYPES.length)
    expect(new Set(DEMO_TARGET_TYPES.map(t => t.affiliation))).toEqual(new Set(['friendly', 'hostile', 'neutral']))
    // Features by the trade's headings (product.md).
    for (const t of aircraft) expect(Object.keys(t.features).sort()).toEqual(['engines', 'fuselage', 'tail', 'wings'])
    for (const t of vessels) expect(Object.keys(t.features).sort()).toEqual(['armament', 'hull', 'masts', 'superstructure'])
    for (const t of DEMO_TARGET_TYPES) {
      expect(t.sizeMetres).toBe(t.params.kind === 'aircraft' ? t.params.span : t.params.length)
      for (const a of t.aspects) expect(ASPECTS).toContain(a)
    }
  })

  it('has look-alike pairs (3+ aircraft, 2+ vessel) whose parameters differ in one or two features', () => {
    const differing = (a: object, b: object) => Object.keys({ ...a, ...b })
      .filter(k => JSON.stringify((a as Record<string, unknown>)[k]) !== JSON.stringify((b as Record<string, unknown>)[k]))
    let aircraftPairs = 0
    let vesselPairs = 0
    for (const [x, y] of LOOK_ALIKE_PAIRS) {
      const a = demoTargetType(x)!
      const b = demoTargetType(y)!
      expect(a.category).toBe(b.category)
      const diff = differing(a.params, b.params)
      expect(diff.length).toBeGreaterThanOrEqual(1)
      expect(diff.length).toBeLessThanOrEqual(3)
      if (a.category === 'aircraft') aircraftPairs++
      else vesselPairs++
    }
    expect(aircraftPairs).toBeGreaterThanOrEqual(3)
    expect(vesselPairs).toBeGreaterThanOrEqual(2)
  })

  it('look-alike silhouettes overlap far more than unrelated ones', () => {
    const overlap = (x: string, y: string) => {
      const a = drawSilhouette(demoTargetType(x)!.params, 'beam', { width: 300, height: 200 })
      const b = drawSilhouette(demoTargetType(y)!.params, 'beam', { width: 300, height: 200 })
      let both = 0
      let either = 0
      for (let i = 3; i < a.data.length; i += 4) {
        const p = a.data[i]! >= 128
        const q = b.data[i]! >= 128
        if (p && q) both++
        if (p || q) either++
      }
      return both / either
    }
    expect(overlap('pemmerly', 'brenisk')).toBeGreaterThan(overlap('pemmerly', 'ivrosse') + 0.2)
    expect(overlap('stennwick', 'tulgeth')).toBeGreaterThan(overlap('stennwick', 'marrobeck') + 0.2)
  })

  it('yields a PNG for every type at each of its aspects, black on transparent, that the mask takes by alpha', async () => {
    let count = 0
    for await (const { type, aspect, png } of demoSilhouettes({ width: 240, height: 160 })) {
      const img = await decodeImage(png, 'image/png')
      expect([img.width, img.height]).toEqual([240, 160])
      const s = extractSilhouette(img.data, img.width, img.height)
      expect(s.method, `${type.key} ${aspect}`).toBe('alpha')
      const box = maskBounds(s)!
      // Fitted into the canvas with a 6 % margin on the limiting side.
      expect(Math.max(box.width / 240, box.height / 160)).toBeGreaterThan(0.8)
      expect(img.data[0]).toBe(0)
      count++
    }
    expect(count).toBe(DEMO_TARGET_TYPES.reduce((n, t) => n + t.aspects.length, 0))
  })

  it('draws aircraft wider than tall head-on and in plan, vessels longer than tall at beam', () => {
    const t = demoTargetType('quarnel')!
    const head = maskBounds(extractSilhouette(drawSilhouette(t.params, 'head-on').data, 1200, 800))!
    expect(head.width).toBeGreaterThan(head.height)
    const v = demoTargetType('stennwick')!
    const beam = maskBounds(extractSilhouette(drawSilhouette(v.params, 'beam').data, 1200, 800))!
    expect(beam.width).toBeGreaterThan(3 * beam.height)
  })
})
