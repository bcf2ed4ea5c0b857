import { describe, expect, it } from 'vitest';
import { buildInspection } from '../testing/builders.ts';
import { scenarios } from '../testing/scenarios.ts';
import { demoPriceBook } from '../costing/price-book.ts';
import { inspectionSchema } from '../model/schemas.ts';
import { analyseInspection } from './analyse.ts';
import * as core from '../index.ts';

describe('analyseInspection', () => {
  for (const scenario of scenarios) {
    it(`"${scenario.name}" → ${scenario.expected}: every part is present and JSON-safe`, () => {
      const analysis = analyseInspection(buildInspection(scenario.spec), demoPriceBook, { currentYear: 2025, demoPrices: true });
      expect(analysis.grade.level).toBe(scenario.expected);
      expect(analysis.summary.text.length).toBeGreaterThan(50);
      expect(analysis.cautions.map((c) => c.id)).toContain('camera_survey_only');
      expect(analysis.diagram.lanes.length).toBeGreaterThan(0);
      expect(analysis.slope.caveat).toMatch(/tenth of the depth/);
      // the server stores it as JSON: no BigInt, no functions, survives a round trip
      expect(JSON.parse(JSON.stringify(analysis))).toEqual(analysis);
    });
  }

  it('a clear line has no cost options and only a monitor recommendation', () => {
    const analysis = analyseInspection(buildInspection(scenarios[0]!.spec), demoPriceBook);
    expect(analysis.costs.options).toEqual([]);
    expect(analysis.costs.proposed).toBeNull();
    expect(analysis.recommendations.line.map((r) => r.kind)).toEqual(['monitor']);
  });

  it('pins, recommendations and grade drivers refer to the same observation ids', () => {
    const inspection = buildInspection(scenarios[4]!.spec);
    const analysis = analyseInspection(inspection, demoPriceBook);
    const observationIds = new Set(inspection.runs.flatMap((r) => r.observations.map((o) => o.id)));
    expect(analysis.diagram.lanes.flatMap((l) => l.pins).length).toBeGreaterThan(0);
    for (const pin of analysis.diagram.lanes.flatMap((l) => l.pins)) expect(observationIds.has(pin.observationId)).toBe(true);
    for (const d of analysis.grade.drivers) for (const id of d.observationIds) expect(observationIds.has(id)).toBe(true);
    for (const r of analysis.recommendations.findings) for (const id of r.observationIds) expect(observationIds.has(id)).toBe(true);
  });

  it('demo prices say so in the assumptions', () => {
    const analysis = analyseInspection(buildInspection(scenarios[2]!.spec), demoPriceBook, { demoPrices: true });
    expect(analysis.costs.options[0]?.assumptions.join(' ')).toMatch(/demo defaults from consumer cost guides/);
  });

  it('is exported from the package entry together with the schemas the server parses with', () => {
    expect(core.analyseInspection).toBe(analyseInspection);
    expect(core.inspectionSchema).toBe(inspectionSchema);
    expect(typeof core.renderDiagramSvg).toBe('function');
    expect(typeof core.can).toBe('function');
  });
});
