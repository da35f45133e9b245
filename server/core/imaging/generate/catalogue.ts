// The invented demo scenario: made-up target types, their silhouettes' parameters and the pairs
// that look alike. No real aircraft or vessel is described here.
import type { Aspect } from '../../../../shared/utils/conditions'
import type { AircraftParams } from './aircraft'
import { type DrawOptions, type SilhouetteParams, silhouettePng } from './index'
import type { VesselParams } from './vessel'

export type Affiliation = 'friendly' | 'hostile' | 'neutral'

export interface DemoTargetType {
  /** stable key, used for file names and seeding */
  key: string
  name: string
  category: 'aircraft' | 'vessel'
  affiliation: Affiliation
  /** span for aircraft, length for vessels, in metres */
  sizeMetres: number
  /** recognition features in words, by the trade's headings */
  features: Record<string, string>
  params: SilhouetteParams
  aspects: Aspect[]
}

export const AIRCRAFT_ASPECTS: Aspect[] = ['beam', 'plan', 'head-on']
export const VESSEL_ASPECTS: Aspect[] = ['beam', 'bow-quarter', 'head-on']

function aircraft(
  key: string, name: string, affiliation: Affiliation,
  features: { wings: string, engines: string, fuselage: string, tail: string },
  params: Omit<AircraftParams, 'kind'>,
): DemoTargetType {
  return { key, name, category: 'aircraft', affiliation, sizeMetres: params.span, features, params: { kind: 'aircraft', ...params }, aspects: AIRCRAFT_ASPECTS }
}

function vessel(
  key: string, name: string, affiliation: Affiliation,
  features: { hull: string, superstructure: string, masts: string, armament: string },
  params: Omit<VesselParams, 'kind'>,
): DemoTargetType {
  return { key, name, category: 'vessel', affiliation, sizeMetres: params.length, features, params: { kind: 'vessel', ...params }, aspects: VESSEL_ASPECTS }
}

const TWIN_JET_FIGHTER: Omit<AircraftParams, 'kind'> = {
  fuselageLength: 17, fuselageWidth: 2.2, span: 11.6, wingPlan: 'swept', sweep: 42, wingPosition: 'mid',
  wingRootChord: 5.6, wingStation: 0.42, dihedral: 0, engines: { count: 2, place: 'fuselage' },
  tail: 'twin-fin', finHeight: 2.8, tailSpan: 7.2, noseLength: 0.24, nose: 'pointed', canopy: true,
}

const HIGH_WING_LIFTER: Omit<AircraftParams, 'kind'> = {
  fuselageLength: 30, fuselageWidth: 4.4, span: 40, wingPlan: 'straight', sweep: 4, wingPosition: 'high',
  wingRootChord: 4.6, wingStation: 0.36, dihedral: 1, engines: { count: 4, place: 'wing-pods' },
  tail: 'conventional', finHeight: 7, tailSpan: 15, noseLength: 0.1,
}

const LOW_WING_LINER: Omit<AircraftParams, 'kind'> = {
  fuselageLength: 33, fuselageWidth: 3.7, span: 31, wingPlan: 'swept', sweep: 28, wingPosition: 'low',
  wingRootChord: 6.2, wingStation: 0.4, dihedral: 5, engines: { count: 2, place: 'wing-pods' },
  tail: 'conventional', finHeight: 6, tailSpan: 11.5, noseLength: 0.12,
}

const DELTA_INTERCEPTOR: Omit<AircraftParams, 'kind'> = {
  fuselageLength: 15, fuselageWidth: 1.9, span: 8.6, wingPlan: 'delta', sweep: 58, wingPosition: 'mid',
  wingRootChord: 8.4, wingStation: 0.36, dihedral: 0, engines: { count: 1, place: 'fuselage' },
  tail: 'fin-only', finHeight: 3.4, tailSpan: 0, noseLength: 0.28, nose: 'pointed', canopy: true,
}

export const DEMO_TARGET_TYPES: DemoTargetType[] = [
  aircraft('taskavel', 'Taskavel', 'friendly',
    { wings: 'mid-set, swept 42 degrees', engines: 'two, inside the fuselage, side intakes', fuselage: 'slender, long pointed nose', tail: 'twin fins canted outwards' },
    TWIN_JET_FIGHTER),
  aircraft('morquin', 'Morquin', 'hostile',
    { wings: 'mid-set, swept 42 degrees', engines: 'two, inside the fuselage, side intakes', fuselage: 'slender, long pointed nose', tail: 'single fin, tailplane low' },
    { ...TWIN_JET_FIGHTER, tail: 'conventional', finHeight: 3.8 }),
  aircraft('pemmerly', 'Pemmerly', 'friendly',
    { wings: 'high, straight, long span', engines: 'four pods under the wing', fuselage: 'wide, blunt nose', tail: 'tailplane high on the fin (T-tail)' },
    { ...HIGH_WING_LIFTER, tail: 't-tail' }),
  aircraft('brenisk', 'Brenisk', 'hostile',
    { wings: 'high, straight, long span', engines: 'four pods under the wing', fuselage: 'wide, blunt nose', tail: 'tailplane low on the fuselage' },
    HIGH_WING_LIFTER),
  aircraft('quarnel', 'Quarnel', 'neutral',
    { wings: 'low, swept, dihedral', engines: 'two pods under the wing', fuselage: 'long tube, rounded nose', tail: 'tailplane low on the fuselage' },
    LOW_WING_LINER),
  aircraft('dellavin', 'Dellavin', 'hostile',
    { wings: 'low, swept, dihedral', engines: 'two pods beside the rear fuselage', fuselage: 'long tube, rounded nose', tail: 'tailplane high on the fin (T-tail)' },
    { ...LOW_WING_LINER, engines: { count: 2, place: 'tail' }, tail: 't-tail', wingStation: 0.45 }),
  aircraft('ulvetta', 'Ulvetta', 'friendly',
    { wings: 'delta, no tailplane', engines: 'one, inside the fuselage, side intakes', fuselage: 'slender, needle nose', tail: 'single tall fin' },
    DELTA_INTERCEPTOR),
  aircraft('zoltavey', 'Zoltavey', 'hostile',
    { wings: 'delta, no tailplane', engines: 'two, inside the fuselage, side intakes', fuselage: 'slender, needle nose', tail: 'single tall fin, broader' },
    { ...DELTA_INTERCEPTOR, engines: { count: 2, place: 'fuselage' }, fuselageWidth: 2.3 }),
  aircraft('ivrosse', 'Ivrosse', 'neutral',
    { wings: 'low, straight', engines: 'one propeller in the nose', fuselage: 'short, small cabin', tail: 'conventional' },
    { fuselageLength: 8.4, fuselageWidth: 1.3, span: 10.4, wingPlan: 'tapered', sweep: 3, wingPosition: 'low', wingRootChord: 1.8, wingStation: 0.3, dihedral: 6, engines: { count: 1, place: 'nose-prop' }, tail: 'conventional', finHeight: 1.5, tailSpan: 3.4, noseLength: 0.14 }),
  aircraft('cathrow', 'Cathrow', 'hostile',
    { wings: 'high, straight, very long and thin', engines: 'one propeller in the nose', fuselage: 'slim pod', tail: 'V-tail' },
    { fuselageLength: 9, fuselageWidth: 1.1, span: 16, wingPlan: 'straight', sweep: 0, wingPosition: 'high', wingRootChord: 1.1, wingStation: 0.35, dihedral: 2, engines: { count: 1, place: 'nose-prop' }, tail: 'v-tail', finHeight: 1.6, tailSpan: 3.8, noseLength: 0.18 }),

  vessel('stennwick', 'Stennwick', 'friendly',
    { hull: 'long, raked bow, transom stern', superstructure: 'bridge block forward, hangar aft', masts: 'one lattice mast', armament: 'one medium gun forward' },
    { length: 122, beam: 14.5, freeboard: 6, sheer: 2.5, bow: 'raked', stern: 'transom',
      blocks: [{ at: 0.3, length: 18, height: 6, slope: 2 }, { at: 0.29, length: 9, height: 3, stacked: true }, { at: 0.62, length: 24, height: 5.5 }],
      masts: [{ at: 0.32, height: 15, kind: 'lattice' }], funnels: [{ at: 0.47, height: 6.5, length: 9 }], guns: [{ at: 0.14, size: 'medium' }] }),
  vessel('tulgeth', 'Tulgeth', 'hostile',
    { hull: 'long, raked bow, transom stern', superstructure: 'bridge block forward, hangar aft', masts: 'one pole mast', armament: 'two medium guns forward' },
    { length: 122, beam: 14.5, freeboard: 6, sheer: 2.5, bow: 'raked', stern: 'transom',
      blocks: [{ at: 0.3, length: 18, height: 6, slope: 2 }, { at: 0.29, length: 9, height: 3, stacked: true }, { at: 0.62, length: 24, height: 5.5 }],
      masts: [{ at: 0.32, height: 16, kind: 'pole' }], funnels: [{ at: 0.47, height: 6.5, length: 9 }], guns: [{ at: 0.1, size: 'medium' }, { at: 0.19, size: 'medium' }] }),
  vessel('ashkarn', 'Ashkarn', 'hostile',
    { hull: 'long and narrow, clipper bow, cruiser stern', superstructure: 'tall bridge, two raked funnels', masts: 'tripod mast', armament: 'two large turrets forward, one aft' },
    { length: 158, beam: 16, freeboard: 7, sheer: 3.5, bow: 'clipper', stern: 'cruiser',
      blocks: [{ at: 0.33, length: 22, height: 5 }, { at: 0.31, length: 10, height: 4, stacked: true, slope: 1.5 }, { at: 0.55, length: 40, height: 3.5 }],
      masts: [{ at: 0.36, height: 18, kind: 'tripod' }], funnels: [{ at: 0.47, height: 9, rake: 14 }, { at: 0.6, height: 8, rake: 14 }],
      guns: [{ at: 0.12, size: 'large' }, { at: 0.2, size: 'large' }, { at: 0.85, size: 'large' }] }),
  vessel('marrobeck', 'Marrobeck', 'neutral',
    { hull: 'full, straight bow, transom stern, low sheer', superstructure: 'accommodation block right aft', masts: 'short pole masts fore and aft of the holds', armament: 'none' },
    { length: 168, beam: 25, freeboard: 8, sheer: 3, bow: 'straight', stern: 'transom',
      blocks: [{ at: 0.86, length: 16, height: 12, width: 0.9 }, { at: 0.86, length: 10, height: 3, stacked: true }],
      masts: [{ at: 0.08, height: 10, kind: 'pole' }, { at: 0.35, height: 14, kind: 'pole' }, { at: 0.6, height: 14, kind: 'pole' }], funnels: [{ at: 0.93, height: 6, length: 7 }], guns: [] }),
  vessel('oskarvel', 'Oskarvel', 'neutral',
    { hull: 'full, straight bow, transom stern, low sheer', superstructure: 'accommodation block right aft', masts: 'one short pole mast forward', armament: 'none' },
    { length: 168, beam: 25, freeboard: 8, sheer: 3, bow: 'straight', stern: 'transom',
      blocks: [{ at: 0.86, length: 16, height: 12, width: 0.9 }, { at: 0.86, length: 10, height: 3, stacked: true }],
      masts: [{ at: 0.08, height: 10, kind: 'pole' }], funnels: [{ at: 0.93, height: 6, length: 7 }], guns: [] }),
  vessel('pellomar', 'Pellomar', 'friendly',
    { hull: 'short, raked bow, high sheer', superstructure: 'one block amidships', masts: 'one pole mast', armament: 'one small gun forward' },
    { length: 54, beam: 8.5, freeboard: 3.2, sheer: 1.6, bow: 'raked', stern: 'transom',
      blocks: [{ at: 0.42, length: 13, height: 3.4, slope: 1.2 }, { at: 0.4, length: 6, height: 2.2, stacked: true, slope: 0.8 }],
      masts: [{ at: 0.45, height: 8, kind: 'pole' }], funnels: [], guns: [{ at: 0.18, size: 'small' }] }),
  vessel('grisvald', 'Grisvald', 'hostile',
    { hull: 'short, raked bow, high sheer', superstructure: 'one block amidships', masts: 'one lattice mast', armament: 'one small gun forward, one aft' },
    { length: 54, beam: 8.5, freeboard: 3.2, sheer: 1.6, bow: 'raked', stern: 'transom',
      blocks: [{ at: 0.42, length: 13, height: 3.4, slope: 1.2 }, { at: 0.4, length: 6, height: 2.2, stacked: true, slope: 0.8 }],
      masts: [{ at: 0.45, height: 8, kind: 'lattice' }], funnels: [], guns: [{ at: 0.18, size: 'small' }, { at: 0.86, size: 'small' }] }),
]

/** Pairs of type keys whose silhouettes differ in one or two features only. */
export const LOOK_ALIKE_PAIRS: readonly (readonly [string, string])[] = [
  ['taskavel', 'morquin'],
  ['pemmerly', 'brenisk'],
  ['quarnel', 'dellavin'],
  ['ulvetta', 'zoltavey'],
  ['stennwick', 'tulgeth'],
  ['pellomar', 'grisvald'],
  ['marrobeck', 'oskarvel'],
]

export function demoTargetType(key: string): DemoTargetType | undefined {
  return DEMO_TARGET_TYPES.find(t => t.key === key)
}

/** Every demo type at each of its aspects, with the silhouette as PNG bytes. */
export async function* demoSilhouettes(options: DrawOptions = {}): AsyncGenerator<{ type: DemoTargetType, aspect: Aspect, png: Uint8Array }> {
  for (const type of DEMO_TARGET_TYPES) {
    for (const aspect of type.aspects) {
      yield { type, aspect, png: await silhouettePng(type.params, aspect, options) }
    }
  }
}
