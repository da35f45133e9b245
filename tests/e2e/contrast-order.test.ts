// The order of the conditions is a product claim (product.md's glossary, shared/utils/conditions.ts
// CONDITION_DIFFICULTY: haze lowers the contrast, dark cloud has the lowest). Checked here on the
// demo's renderings as the server sends them (GET /images/<file>, decoded with @jsquash/webp).
//
// The measure: Weber contrast |Lt - Lb| / Lb of the target's mean relative luminance on the
// background's (WCAG 2.2 "relative luminance"). Weber, not the WCAG ratio, because a sighting is a
// small target on an extended background, the case Weber contrast describes and the one the
// detection thresholds of vision science are stated in (Blackwell, J. Opt. Soc. Am. 36, 1946;
// Koschmieder's visual range); the WCAG ratio is defined for text on a screen, and its +0.05 flare
// term flattens every difference in a dark scene (goggles, dark cloud). The contrast bands of
// conditions.ts are Weber contrasts too, so the claim and the bands use one measure.
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { signedIn } from '../support/client'
import type { Client } from '../support/client'
import { readDb } from '../support/watch-fixture'
import { decodeWebp, relativeLuminance } from '../support/pixels'
import type { Pixels } from '../support/pixels'

// The demo decks (server/seed/decks.ts); other tests add decks of their own to the same server.
const DEMO_TITLES = ['Coastal air picture', 'Harbour approaches']
// One size of every view: 51 views x 6 conditions = 306 renderings.
const LONG_SIDE = 640

interface Variant { viewId: string, condition: string, file: string }
let admin: Client
let variants: Variant[]
const measured = new Map<string, Record<string, number>>()

async function served(file: string): Promise<Pixels> {
  const r = await fetch(`${inject('baseUrl')}/images/${file}`, { headers: { cookie: admin.cookieHeader() } })
  expect(r.status, file).toBe(200)
  return decodeWebp(Buffer.from(await r.arrayBuffer()))
}

// Pixels whose whole (2r+1)-square neighbourhood has the value `want` in the mask (erosion of the
// target, or of the background), so outline pixels, soft under haze, count for neither side.
function inside(mask: Uint8Array, width: number, height: number, r: number, want: 0 | 1): Uint8Array {
  const out = new Uint8Array(mask.length)
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let all = true
      for (let dy = -r; dy <= r && all; dy++) {
        for (let dx = -r; dx <= r && all; dx++) {
          const yy = y + dy
          const xx = x + dx
          const v = yy < 0 || yy >= height || xx < 0 || xx >= width ? 0 : mask[yy * width + xx]!
          if (v !== want) all = false
        }
      }
      out[y * width + x] = all ? 1 : 0
    }
  }
  return out
}

const luminance = (p: Pixels, i: number) => relativeLuminance(p.data[4 * i]!, p.data[4 * i + 1]!, p.data[4 * i + 2]!)

beforeAll(async () => {
  admin = await signedIn('admin@glint.demo')
  variants = readDb(db => db.prepare(`SELECT v.view_id AS viewId, v.condition, v.file FROM variants v
    JOIN views w ON w.id = v.view_id JOIN target_types t ON t.id = w.target_type_id JOIN decks d ON d.id = t.deck_id
    WHERE d.title IN (${DEMO_TITLES.map(() => '?').join(', ')}) AND max(v.width, v.height) = ? ORDER BY v.view_id`)
    .all(...DEMO_TITLES, LONG_SIDE) as Variant[])
  const byView = new Map<string, Variant[]>()
  for (const v of variants) byView.set(v.viewId, [...(byView.get(v.viewId) ?? []), v])
  for (const [viewId, list] of byView) {
    // Every condition of a view draws the target at the same place. Backlit draws it near black
    // on a bright sky or sea, so there it is simply the pixels below 10 % relative luminance.
    const backlit = await served(list.find(v => v.condition === 'backlit')!.file)
    const { width, height } = backlit
    const mask = new Uint8Array(width * height)
    for (let i = 0; i < mask.length; i++) mask[i] = luminance(backlit, i) < 0.1 ? 1 : 0
    const target = inside(mask, width, height, 2, 1)
    const background = inside(mask, width, height, 3, 0)
    const row: Record<string, number> = {}
    for (const v of list) {
      const p = v.condition === 'backlit' ? backlit : await served(v.file)
      let lt = 0
      let nt = 0
      let lb = 0
      let nb = 0
      for (let i = 0; i < mask.length; i++) {
        if (target[i]) {
          lt += luminance(p, i)
          nt++
        }
        else if (background[i]) {
          lb += luminance(p, i)
          nb++
        }
      }
      // A view too thin for 8 core pixels at this size has no target mean worth comparing.
      if (nt < 8) continue
      row[v.condition] = Math.abs(lt / nt - lb / nb) / (lb / nb)
    }
    measured.set(viewId, row)
  }
}, 240_000)

describe('the order of the conditions holds on the served renderings (Weber contrast)', () => {
  it('reads every demo rendering of one size: 51 views under the 6 conditions', () => {
    expect(variants).toHaveLength(306)
    expect(measured.size).toBe(51)
    for (const row of measured.values()) expect(Object.keys(row).sort()).toEqual(['backlit', 'dark-cloud', 'goggles', 'haze', 'sunlit', 'white-cloud'])
  })

  // From backlit on, the difficulty order is an order of contrast: backlit > haze > goggles > dark cloud.
  it.each([['backlit', 'haze'], ['haze', 'goggles'], ['goggles', 'dark-cloud']])('%s has more contrast than %s in every view', (easier, harder) => {
    const flipped = [...measured].filter(([, c]) => !(c[easier]! > c[harder]!))
      .map(([id, c]) => `${id}: ${easier} ${c[easier]!.toFixed(3)} <= ${harder} ${c[harder]!.toFixed(3)}`)
    expect(flipped).toEqual([])
  })

  it('each easy case (white cloud, sunlit, backlit) has more contrast than each hard case (haze, goggles, dark cloud) in every view', () => {
    const flipped: string[] = []
    for (const [id, c] of measured) {
      for (const easy of ['white-cloud', 'sunlit', 'backlit']) {
        for (const hard of ['haze', 'goggles', 'dark-cloud']) {
          if (!(c[easy]! > c[hard]!)) flipped.push(`${id}: ${easy} ${c[easy]!.toFixed(3)} <= ${hard} ${c[hard]!.toFixed(3)}`)
        }
      }
    }
    expect(flipped).toEqual([])
  })
})
