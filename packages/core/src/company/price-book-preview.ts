import { buildCostOptions, type CostOptionKind } from '../costing/cost-options.ts';
import type { PriceBook } from '../costing/price-book.ts';
import { feet } from '../footage/footage.ts';
import { inspectionSchema, type Inspection } from '../model/schemas.ts';
import { planRepairs, type RepairPlan } from '../recommendations/repair-plan.ts';

/**
 * An invented sample inspection for the price-book preview: the office sees
 * how its prices move the cost options of a typical older clay lateral before
 * saving. Invented house and findings; no real job.
 *
 * It has something for every part of the price book: roots to cut, two damaged
 * stretches (one under the concrete driveway, one deeper than the dig price
 * includes), a sag a liner cannot fix, and depth readings.
 */
export const priceBookSampleInspection: Inspection = inspectionSchema.parse({
  id: 'price-book-sample',
  property: { yearBuilt: 1956, type: 'single_family', notes: 'Sample for the price book preview.' },
  accessPoints: [{ id: 'sample-ap', kind: 'cleanout_two_way', locationNote: 'front yard, by the walk' }],
  runs: [
    {
      id: 'sample-run',
      accessPointId: 'sample-ap',
      direction: 'toward_main',
      distanceReached: feet(84),
      endReason: 'reached_main',
      sections: [
        { id: 'sample-s1', from: 0, to: feet(6), material: 'cast_iron', diameterIn: 4 },
        { id: 'sample-s2', from: feet(6), to: feet(84), material: 'vitrified_clay', diameterIn: 4 },
      ],
      observations: [
        { id: 'sample-o1', kind: 'material_change', at: feet(6), fromMaterial: 'cast_iron', toMaterial: 'vitrified_clay' },
        { id: 'sample-o2', kind: 'roots', at: feet(22), severity: 3 },
        { id: 'sample-o3', kind: 'open_crack', at: feet(37), severity: 4 },
        { id: 'sample-o4', kind: 'joint_offset', at: feet(39.5), severity: 4 },
        { id: 'sample-o5', kind: 'sag', at: feet(58), to: feet(63), severity: 4 },
        { id: 'sample-o6', kind: 'main_connection', at: feet(84) },
      ],
      depthReadings: [
        { at: 0, depth: feet(2.5) },
        { at: feet(40), depth: feet(5) },
        { at: feet(60), depth: feet(7) },
        { at: feet(84), depth: feet(8) },
      ],
      surfaces: [{ from: feet(30), to: feet(46), surface: 'concrete' }],
    },
  ],
  checkedNotFound: ['collapse'],
});

export const priceBookSampleDescription =
  'A sample 1956 house: 84 ft of clay pipe with roots, a cracked and offset joint under the concrete driveway, and a sag at 58 ft, about 7 ft down.';

let samplePlan: RepairPlan | undefined;

/** The sample's repair plan does not depend on prices, so it is worked out once. */
function plan(): RepairPlan {
  samplePlan ??= planRepairs(priceBookSampleInspection);
  return samplePlan;
}

export interface CostPreviewRow {
  kind: CostOptionKind;
  name: string;
  proposed: boolean;
  /** Range with the saved price book. */
  before: { lowCents: number; highCents: number };
  /** Range with the edited price book; null while the edits do not validate. */
  after: { lowCents: number; highCents: number } | null;
}

/** Cost options of the sample inspection with a price book. */
export function sampleCostOptions(book: PriceBook) {
  return buildCostOptions(plan(), book);
}

/**
 * Side by side: the sample's cost options with the saved book and with the
 * edited one (null while the edits have errors).
 */
export function compareSampleCosts(saved: PriceBook, edited: PriceBook | null): CostPreviewRow[] {
  const before = sampleCostOptions(saved);
  const after = edited ? sampleCostOptions(edited) : null;
  return before.options.map((option) => {
    const changed = after?.options.find((o) => o.kind === option.kind);
    return {
      kind: option.kind,
      name: option.name,
      proposed: option.proposed,
      before: { lowCents: option.lowCents, highCents: option.highCents },
      after: changed ? { lowCents: changed.lowCents, highCents: changed.highCents } : null,
    };
  });
}
