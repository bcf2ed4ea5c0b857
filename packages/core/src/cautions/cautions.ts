import type { GradeLevel } from '../model/schemas.ts';
import type { Material } from '../model/kinds.ts';
import type { RecommendationKind } from '../recommendations/recommendations.ts';
import type { CostOptionKind } from '../costing/cost-options.ts';
import { hazardousMaterials } from '../checks/materials.ts';

/**
 * The cautions of PRODUCT.md §8, in plain words, as data. Where work can hurt
 * someone, the text says so and defers to local codes and licensed contractors.
 */
export const cautionIds = [
  'camera_survey_only',
  'estimates_not_quotes',
  'licensed_and_permitted',
  'locate_before_digging',
  'open_excavation',
  'high_pressure_jetting',
  'sewer_gas',
  'failing_line',
  'asbestos_pipe',
] as const;
export type CautionId = (typeof cautionIds)[number];

export type CautionPlace = 'report_footer' | 'cost_section' | 'pdf';

export interface Caution {
  id: CautionId;
  title: string;
  text: string;
  /** Where the report shows it. */
  places: readonly CautionPlace[];
}

export const cautions: Record<CautionId, Caution> = {
  camera_survey_only: {
    id: 'camera_survey_only',
    title: 'What this report is',
    text: 'This report is a visual camera survey of the inside of the pipe on one day. It is not an engineering assessment and not a warranty. Parts of the pipe the camera could not see, and the outside of the pipe, were not checked.',
    places: ['report_footer', 'pdf'],
  },
  estimates_not_quotes: {
    id: 'estimates_not_quotes',
    title: 'Costs are estimates',
    text: 'Repair costs are estimated ranges, not quotes. The real price depends on the site and is set by the contractor who does the work.',
    places: ['cost_section', 'pdf'],
  },
  licensed_and_permitted: {
    id: 'licensed_and_permitted',
    title: 'Use licensed contractors',
    text: 'Sewer repairs need a licensed contractor and, in most places, a permit. Local codes govern the work and may differ from what this report says.',
    places: ['cost_section', 'report_footer', 'pdf'],
  },
  // 811 is the US call-before-you-dig number (from memory).
  locate_before_digging: {
    id: 'locate_before_digging',
    title: 'Locate utilities before digging',
    text: 'Before anyone digs, buried gas, power, water and phone lines must be found and marked. In the US, call 811 a few days ahead.',
    places: ['cost_section', 'pdf'],
  },
  open_excavation: {
    id: 'open_excavation',
    title: 'Open digs are dangerous',
    text: 'Trenches and pits can cave in without warning. Keep people and pets away, and leave any work in a trench to trained crews who shore it as local rules require.',
    places: ['cost_section', 'pdf'],
  },
  high_pressure_jetting: {
    id: 'high_pressure_jetting',
    title: 'High-pressure jetting',
    text: 'Hydro-jetting uses water at pressures that can cut skin and can damage a weak pipe. It is work for a trained, licensed crew, not a rental tool.',
    places: ['cost_section', 'pdf'],
  },
  sewer_gas: {
    id: 'sewer_gas',
    title: 'Sewer gas',
    text: 'Sewer gas can make people ill, and in closed spaces it can kill or catch fire. Keep cleanout caps closed, and never enter a pit, tank or manhole to look.',
    places: ['report_footer', 'pdf'],
  },
  failing_line: {
    id: 'failing_line',
    title: 'A failing line can back up',
    text: 'A failed sewer line can back sewage into the house or the yard. Until it is fixed, use as little water as you can, and keep clear of any sewage, which carries germs.',
    places: ['report_footer', 'pdf'],
  },
  asbestos_pipe: {
    id: 'asbestos_pipe',
    title: 'Asbestos-cement pipe',
    text: 'Asbestos-cement pipe can release harmful fibres when it is cut or broken. Only trained, licensed crews should remove or repair it, following local rules.',
    places: ['cost_section', 'pdf'],
  },
};

export interface CautionContext {
  grade: GradeLevel;
  recommendationKinds: readonly RecommendationKind[];
  costOptionKinds: readonly CostOptionKind[];
  materials: readonly Material[];
}

const digging: readonly RecommendationKind[] = ['spot_repair', 'pipe_bursting', 'open_trench', 'add_cleanout'];
const diggingOptions: readonly CostOptionKind[] = ['spot_repairs', 'burst_runs', 'replace_runs'];

/** The cautions that apply, in the order the report shows them. */
export function selectCautions(context: CautionContext): Caution[] {
  const chosen: CautionId[] = ['camera_survey_only'];
  const anyWork = context.recommendationKinds.some((k) => k !== 'monitor') || context.costOptionKinds.length > 0;
  if (context.costOptionKinds.length > 0) chosen.push('estimates_not_quotes');
  if (anyWork) chosen.push('licensed_and_permitted');
  if (context.recommendationKinds.some((k) => digging.includes(k)) || context.costOptionKinds.some((k) => diggingOptions.includes(k))) {
    chosen.push('locate_before_digging', 'open_excavation');
  }
  if (context.recommendationKinds.includes('hydro_jetting') || context.costOptionKinds.includes('cleaning')) {
    chosen.push('high_pressure_jetting');
  }
  chosen.push('sewer_gas');
  if (context.grade === 'failing') chosen.push('failing_line');
  if (context.materials.some((m) => hazardousMaterials.includes(m))) chosen.push('asbestos_pipe');
  return chosen.map((id) => cautions[id]);
}
