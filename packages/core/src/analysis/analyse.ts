import type { UnitSystem } from '../footage/footage.ts';
import { collectFindings } from '../model/findings.ts';
import type { Material } from '../model/kinds.ts';
import type { Inspection } from '../model/schemas.ts';
import { gradeInspection, type GradeResult } from '../grading/grade.ts';
import { planRepairs, type RepairPlan } from '../recommendations/repair-plan.ts';
import { recommend, type Recommendation } from '../recommendations/recommendations.ts';
import { buildCostOptions, type CostOptionsResult } from '../costing/cost-options.ts';
import type { PriceBook } from '../costing/price-book.ts';
import { analyseSlope, type SlopeResult } from '../slope/slope.ts';
import { runChecks, type Check } from '../checks/checks.ts';
import { summarise, type Summary } from '../summary/summary.ts';
import { selectCautions, type Caution } from '../cautions/cautions.ts';
import { layoutDiagram, type DiagramModel } from '../diagram/layout.ts';

export interface AnalysisOptions {
  /** Footage display: feet and inches (default) or metres. */
  units?: UnitSystem;
  /** The year pipe ages are measured against (defaults to this year). */
  currentYear?: number;
  /** Say in the cost assumptions that the prices are demo defaults. */
  demoPrices?: boolean;
}

export interface Analysis {
  grade: GradeResult;
  recommendations: { findings: Recommendation[]; line: Recommendation[] };
  repairPlan: Pick<RepairPlan, 'proposal' | 'reasons'>;
  costs: CostOptionsResult;
  slope: SlopeResult;
  checks: Check[];
  summary: Summary;
  cautions: Caution[];
  diagram: DiagramModel;
}

/**
 * Everything the product computes from one inspection (PRODUCT.md §5), in one call.
 * Pure: the server stores the result, the browser previews it live. The input is an
 * inspection already parsed with `inspectionSchema`.
 */
export function analyseInspection(inspection: Inspection, priceBook: PriceBook, options: AnalysisOptions = {}): Analysis {
  const units = options.units ?? 'imperial';
  const findings = collectFindings(inspection);
  const grade = gradeInspection(inspection, { units, findings });
  const plan = planRepairs(inspection, { units, findings });
  const recommendations = recommend(inspection, findings, plan, grade.level, { units });
  const costs = buildCostOptions(plan, priceBook, { demoPrices: options.demoPrices ?? false });
  const slope = analyseSlope(inspection, units);
  const checks = runChecks(inspection, {
    units,
    slope,
    ...(options.currentYear !== undefined ? { currentYear: options.currentYear } : {}),
  });
  const summary = summarise({ inspection, grade, findings, plan, costs, units });

  const materials = new Set<Material>();
  for (const run of inspection.runs) for (const section of run.sections) materials.add(section.material);
  const recommendationKinds = [...recommendations.findings, ...recommendations.line].flatMap((r) => [r.kind, ...r.alternatives]);
  const cautions = selectCautions({
    grade: grade.level,
    recommendationKinds,
    costOptionKinds: costs.options.map((o) => o.kind),
    materials: [...materials],
  });
  const diagram = layoutDiagram(inspection, { units });
  return {
    grade,
    recommendations,
    repairPlan: { proposal: plan.proposal, reasons: plan.reasons },
    costs,
    slope,
    checks,
    summary,
    cautions,
    diagram,
  };
}
