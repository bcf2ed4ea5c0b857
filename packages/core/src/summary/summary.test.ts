import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { flesch } from 'flesch';
import { fleschKincaid } from 'flesch-kincaid';
import { syllable } from 'syllable';
import { buildInspection, type InspectionSpec, type ObservationSpec } from '../testing/builders.ts';
import { scenarios } from '../testing/scenarios.ts';
import { countText, numberInWords, readability } from '../testing/readability.ts';
import { analyseInspection } from '../analysis/analyse.ts';
import { demoPriceBook } from '../costing/price-book.ts';
import { accessPointKinds, defectKinds, materials } from '../model/kinds.ts';

describe('the readability packages against the published worked values (Flesch 1948; Kincaid et al. 1975)', () => {
  it('1 sentence, 6 words, 6 syllables → reading ease 116.145', () => {
    expect(flesch({ sentence: 1, word: 6, syllable: 6 })).toBeCloseTo(116.145, 3);
  });
  it('1 sentence, 13 words, 24 syllables → reading ease 37.455 and grade 11.265', () => {
    expect(flesch({ sentence: 1, word: 13, syllable: 24 })).toBeCloseTo(37.455, 3);
    expect(fleschKincaid({ sentence: 1, word: 13, syllable: 24 })).toBeCloseTo(11.265, 3);
  });
  it('1 sentence, 13 words, 26 syllables → grade 13.08', () => {
    expect(fleschKincaid({ sentence: 1, word: 13, syllable: 26 })).toBeCloseTo(13.08, 2);
  });
  it('the syllable package counts ordinary words as a reader would (common practice, no source)', () => {
    expect(syllable('sewer')).toBe(2);
    expect(syllable('line')).toBe(1);
    expect(syllable('cleanout')).toBe(2);
    expect(syllable('inspection')).toBe(3);
  });
  it('our word and sentence split feeds the packages sensible counts; numbers are read aloud', () => {
    expect(countText('Your sewer line looks good. It is about 52 feet long.')).toEqual({ sentence: 2, word: 11, syllable: 15 });
    expect(numberInWords(4800)).toBe('four thousand eight hundred');
    expect(countText('It costs $4,800.').syllable).toBe(1 + 1 + syllable('four thousand eight hundred dollars'));
  });
});

const PLAIN = { ease: 60, grade: 8 }; // CHECKS.md bands: aim at ease ≥ 60 and grade ≤ 8

const expectPlain = (text: string) => {
  const score = readability(text);
  expect(score.ease, `ease of: ${text}`).toBeGreaterThanOrEqual(PLAIN.ease);
  expect(score.grade, `grade of: ${text}`).toBeLessThanOrEqual(PLAIN.grade);
};

describe('summaries', () => {
  for (const scenario of scenarios) {
    it(`"${scenario.name}": second person, plain, ease ≥ 60 and grade ≤ 8 (Flesch 1948; Kincaid et al. 1975)`, () => {
      const { summary, grade } = analyseInspection(buildInspection(scenario.spec), demoPriceBook, { currentYear: 2025 });
      expect(grade.level).toBe(scenario.expected);
      expect(summary.sentences[0]).toMatch(/^Your sewer line/);
      expect(summary.sentences.length).toBeGreaterThanOrEqual(3);
      expect(summary.sentences.length).toBeLessThanOrEqual(9);
      expectPlain(summary.text);
    });
  }

  it('says what the grade means and where the worst spot is', () => {
    const failing = scenarios.find((s) => s.expected === 'failing')!;
    const { summary } = analyseInspection(buildInspection(failing.spec), demoPriceBook);
    expect(summary.text).toMatch(/failed/);
    expect(summary.text).toMatch(/about 47 feet from the cleanout/);
    expect(summary.text).toMatch(/could not reach the city sewer/);
    expect(summary.text).toMatch(/A fix may cost about \$[\d,]+ to \$[\d,]+\./);
  });

  it('a clear line says what was looked for and not found', () => {
    const clear = scenarios.find((s) => s.expected === 'clear')!;
    const { summary } = analyseInspection(buildInspection(clear.spec), demoPriceBook);
    expect(summary.text).toMatch(/We looked for cracks, low spots, standing water and joints out of line, and found none\./);
    expect(summary.text).not.toMatch(/cost/);
  });

  it('metric display speaks in metres', () => {
    const clear = scenarios.find((s) => s.expected === 'clear')!;
    const { summary } = analyseInspection(buildInspection(clear.spec), demoPriceBook, { units: 'metric' });
    expect(summary.text).toMatch(/about 22 metres of pipe/);
  });

  it('every summary generated from random inspections stays plain (ease ≥ 60, grade ≤ 8; Flesch 1948; Kincaid et al. 1975)', () => {
    const observation: fc.Arbitrary<ObservationSpec> = fc
      .record({
        kind: fc.constantFrom(...defectKinds),
        at: fc.integer({ min: 0, max: 1190 }).map((n) => n / 10),
        length: fc.oneof(
          fc.constant(0),
          fc.integer({ min: 1, max: 300 }).map((n) => n / 10),
        ),
        severity: fc.integer({ min: 1, max: 5 }),
      })
      .map(({ kind, at, length, severity }) =>
        length > 0 ? { kind, at, to: Math.min(120, at + length), severity } : { kind, at, severity },
      );
    const spec: fc.Arbitrary<InspectionSpec> = fc
      .record({
        yearBuilt: fc.option(fc.integer({ min: 1900, max: 2020 }), { nil: null }),
        access: fc.constantFrom(...accessPointKinds),
        material: fc.constantFrom(...materials),
        size: fc.constantFrom(3, 4, 6),
        mainRun: fc.array(observation, { maxLength: 12 }),
        reached: fc.boolean(),
        buildingRun: fc.option(
          fc.array(
            observation.map((o) => ({ ...o, at: Math.min(o.at, 20), ...(o.to !== undefined ? { to: Math.min(o.to, 20) } : {}) })),
            { maxLength: 3 },
          ),
          { nil: null },
        ),
        checked: fc.subarray([...defectKinds], { maxLength: 6 }),
      })
      .map((r) => ({
        yearBuilt: r.yearBuilt,
        accessPoints: [{ id: 'ap-1', kind: r.access }],
        runs: [
          {
            direction: 'toward_main' as const,
            distance: 120,
            endReason: r.reached ? ('reached_main' as const) : ('obstruction' as const),
            sections: [[0, 120, r.material, r.size] as [number, number, (typeof materials)[number], number]],
            observations: r.mainRun,
          },
          ...(r.buildingRun
            ? [
                {
                  direction: 'toward_building' as const,
                  distance: 20,
                  sections: [[0, 20, r.material, r.size] as [number, number, (typeof materials)[number], number]],
                  observations: r.buildingRun,
                },
              ]
            : []),
        ],
        checkedNotFound: r.checked.filter((k) => !r.mainRun.some((o) => o.kind === k)),
      }));
    fc.assert(
      fc.property(spec, fc.constantFrom('imperial' as const, 'metric' as const), (s, units) => {
        const { summary } = analyseInspection(buildInspection(s), demoPriceBook, { units, currentYear: 2025 });
        expect(summary.sentences[0]).toMatch(/^Your sewer line/);
        expectPlain(summary.text);
      }),
      { numRuns: 500 },
    );
  }, 60_000); // 500 generated inspections: allow for a busy machine
});
