import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildInspection, type InspectionSpec, type ObservationSpec, type RunSpec } from '../testing/builders.ts';
import { defectKinds, surfaceKinds } from '../model/kinds.ts';
import { planRepairs } from '../recommendations/repair-plan.ts';
import { buildCostOptions, depthAt, formatRange, type CostOption, type CostOptionKind } from './cost-options.ts';
import { Exact, formatCents } from './exact.ts';
import { demoPriceBook, priceBookSchema, priceItemKeys, type PriceBook } from './price-book.ts';
import { feet } from '../footage/footage.ts';

const costsOf = (spec: InspectionSpec, book: PriceBook = demoPriceBook) => {
  const inspection = buildInspection(spec);
  return buildCostOptions(planRepairs(inspection), book);
};
const option = (options: CostOption[], kind: CostOptionKind) => {
  const found = options.find((o) => o.kind === kind);
  if (!found) throw new Error(`no ${kind} option`);
  return found;
};
const dollars = (cents: number) => cents / 100;
const parseExact = (text: string) => {
  const [n, d] = text.split('/');
  return Exact.of(BigInt(n ?? '0'), BigInt(d ?? '1'));
};

describe('Exact arithmetic', () => {
  it('adds and multiplies fractions exactly and rounds once', () => {
    const third = Exact.of(1, 3);
    expect(third.add(third).add(third).toString()).toBe('1');
    expect(Exact.of(7, 2).round()).toBe(4n);
    expect(Exact.of(-7, 2).floor()).toBe(-4n);
    expect(Exact.of(7, 2).ceil()).toBe(4n);
    expect(Exact.fromDecimal(1.15).toString()).toBe('23/20');
    expect(formatCents(480_000)).toBe('$4,800');
    expect(formatCents(12_345)).toBe('$123.45');
  });
});

describe('demo price book', () => {
  it('validates and marks where each price comes from', () => {
    expect(priceBookSchema.safeParse(demoPriceBook).success).toBe(true);
    for (const key of priceItemKeys) {
      expect(demoPriceBook.items[key].note).toMatch(/Demo default/);
    }
  });

  it('matches the CHECKS.md repair cost bands (consumer cost guides, weak, demo defaults)', () => {
    const band = (key: (typeof priceItemKeys)[number]) => [
      dollars(demoPriceBook.items[key].lowCents),
      dollars(demoPriceBook.items[key].highCents),
    ];
    expect(band('root_cutting')).toEqual([150, 500]); // CHECKS.md: $150–500 per visit
    expect(band('hydro_jetting')).toEqual([250, 800]); // CHECKS.md: $250–800 per visit
    expect(band('spot_repair')).toEqual([1000, 3000]); // CHECKS.md: $1,000–3,000 per location
    expect(band('full_lining')).toEqual([80, 250]); // CHECKS.md: $80–250 per ft
    expect(band('pipe_bursting')).toEqual([60, 200]); // CHECKS.md: $60–200 per ft
    expect(band('open_trench')).toEqual([50, 250]); // CHECKS.md: $50–250 per ft
    expect(band('camera_inspection')).toEqual([150, 400]); // CHECKS.md: $150–400
  });

  it('rejects a low price above the high one and a unit that does not fit the item', () => {
    const bad = structuredClone(demoPriceBook);
    bad.items.hydro_jetting.lowCents = 90_000;
    bad.items.full_lining.unit = 'per_visit';
    const result = priceBookSchema.safeParse(bad);
    expect(result.success).toBe(false);
    const text = result.error?.issues.map((i) => i.message).join(' | ');
    expect(text).toMatch(/low price must not be above/);
    expect(text).toMatch(/Cured-in-place lining is priced per foot/);
  });
});

const crackRun = (distance: number, cracksAt: number[], extra: Partial<RunSpec> = {}): InspectionSpec => ({
  runs: [
    {
      distance,
      sections: [[0, distance, 'vitrified_clay', 4]],
      observations: cracksAt.map((at) => ({ kind: 'open_crack', at, severity: 4 })),
      ...extra,
    },
  ],
});

describe('sanity bands (CHECKS.md repair cost bands; consumer cost guides, weak)', () => {
  it('a 60 ft lining option lands inside $4,800–15,000', () => {
    // many spots make lining the proposal; 60 ft × $80–250 per ft (CHECKS.md cured-in-place lining)
    const result = costsOf(crackRun(60, [5, 20, 35, 50]));
    const lining = option(result.options, 'line_runs');
    expect(lining.lowCents).toBeGreaterThanOrEqual(480_000);
    expect(lining.highCents).toBeLessThanOrEqual(1_500_000);
    expect(lining.proposed).toBe(true);
  });

  it('a 70 ft whole-lateral lining falls in the reported typical $6k–12k band at mid-range prices', () => {
    // CHECKS.md: whole laterals typically $6k–12k; the midpoint of 70 ft at $80–250 per ft
    const lining = option(costsOf(crackRun(70, [5, 25, 45])).options, 'line_runs');
    const mid = (lining.lowCents + lining.highCents) / 2;
    expect(mid).toBeGreaterThanOrEqual(600_000);
    expect(mid).toBeLessThanOrEqual(1_200_000);
  });

  it('one spot repair in soil at normal depth lands inside $1,000–3,000 plus a permit', () => {
    const spot = option(costsOf(crackRun(60, [20])).options, 'spot_repairs');
    const permit = demoPriceBook.items.permit;
    expect(spot.lowCents).toBeGreaterThanOrEqual(100_000 + permit.lowCents - 1000);
    expect(spot.highCents).toBeLessThanOrEqual(300_000 + permit.highCents + 1000);
    expect(spot.proposed).toBe(true);
  });

  it('pipe bursting and open trench for 60 ft sit inside their per-foot bands plus a permit', () => {
    const result = costsOf(crackRun(60, [5, 20, 35, 50]));
    const permit = demoPriceBook.items.permit;
    const burst = option(result.options, 'burst_runs');
    expect(burst.lowCents).toBeGreaterThanOrEqual(60 * 6000 + permit.lowCents - 1000); // $60–200 per ft
    expect(burst.highCents).toBeLessThanOrEqual(60 * 20_000 + permit.highCents + 1000);
    const trench = option(result.options, 'replace_runs');
    expect(trench.lowCents).toBeGreaterThanOrEqual(60 * 5000 + permit.lowCents - 1000); // $50–250 per ft
    expect(trench.highCents).toBeLessThanOrEqual(60 * 25_000 + permit.highCents + 1000);
  });

  it('cleaning roots lands inside root cutting $150–500 plus a camera check $150–400', () => {
    const result = costsOf({ runs: [{ distance: 50, observations: [{ kind: 'roots', at: 20, severity: 3 }] }] });
    const cleaning = option(result.options, 'cleaning');
    expect(cleaning.lowCents).toBeGreaterThanOrEqual(30_000);
    expect(cleaning.highCents).toBeLessThanOrEqual(90_000);
    expect(result.proposed).toBe('cleaning');
  });
});

describe('quantities from the findings', () => {
  it('defects within a few feet share one excavation', () => {
    const close = option(costsOf(crackRun(60, [20, 22, 25])).options, 'spot_repairs');
    expect(close.lines.find((l) => l.item === 'spot_repair')?.quantity).toBe(1);
    const apart = option(costsOf(crackRun(60, [10, 40])).options, 'spot_repairs');
    expect(apart.lines.find((l) => l.item === 'spot_repair')?.quantity).toBe(2);
  });

  it('many spots or widespread damage make a full-length method the proposal', () => {
    expect(costsOf(crackRun(80, [10, 40])).proposed).toBe('spot_repairs');
    expect(costsOf(crackRun(80, [10, 30, 50])).proposed).toBe('line_runs'); // three digs
    const widespread = costsOf({
      runs: [{ distance: 40, sections: [[0, 40, 'cast_iron', 4]], observations: [{ kind: 'worn_wall', at: 5, to: 20, severity: 3 }] }],
    });
    expect(widespread.proposed).toBe('line_runs');
  });

  it('a sag needing repair makes open-trench replacement the full-length proposal; a collapse makes it bursting', () => {
    const sag = costsOf(crackRun(80, [10, 30], { observations: [10, 30, 50].map((at) => ({ kind: 'sag', at, to: at + 2, severity: 4 })) }));
    expect(sag.proposed).toBe('replace_runs');
    const collapse = costsOf(
      crackRun(80, [10, 30], {
        observations: [{ kind: 'collapse', at: 5, severity: 4 }, ...[25, 45].map((at) => ({ kind: 'crack', at, severity: 4 }))],
      }),
    );
    expect(collapse.proposed).toBe('burst_runs');
  });

  it('a liner cannot fix a sag: the lining option still digs that spot, with a permit', () => {
    const result = costsOf({
      runs: [
        {
          distance: 60,
          observations: [
            { kind: 'sag', at: 30, to: 33, severity: 4 },
            { kind: 'crack', at: 10, severity: 4 },
          ],
        },
      ],
    });
    const lining = option(result.options, 'line_runs');
    expect(lining.lines.map((l) => l.item)).toEqual(expect.arrayContaining(['full_lining', 'spot_repair', 'permit']));
    const liners = option(result.options, 'sectional_liners');
    expect(liners.lines.find((l) => l.item === 'sectional_liner')?.quantity).toBe(1);
    expect(liners.lines.find((l) => l.item === 'spot_repair')?.quantity).toBe(1);
  });

  it('depth readings below the included depth add a depth line; hard surface adds a restoration line', () => {
    const shallow = option(
      costsOf(
        crackRun(60, [30], {
          depths: [
            [0, 3],
            [60, 4],
          ],
        }),
      ).options,
      'spot_repairs',
    );
    expect(shallow.lines.some((l) => l.item === 'depth_extra')).toBe(false);
    const deep = option(
      costsOf(
        crackRun(60, [30], {
          depths: [
            [0, 6],
            [60, 10],
          ],
          surfaces: [[25, 35, 'concrete']],
        }),
      ).options,
      'spot_repairs',
    );
    const depthLine = deep.lines.find((l) => l.item === 'depth_extra');
    // 8 ft deep at 30 ft: 3 ft below the 5 ft included; low 3 × 10 % × $1,000, high 3 × 25 % × $3,000 (demo defaults)
    expect(depthLine?.lowCents).toBe(30_000);
    expect(depthLine?.highCents).toBe(225_000);
    const surfaceLine = deep.lines.find((l) => l.item === 'surface_extra');
    // one pit of 24 sq ft under concrete at $10–20 per sq ft (invented demo values)
    expect(surfaceLine?.lowCents).toBe(24_000);
    expect(surfaceLine?.highCents).toBe(48_000);
    expect(
      depthAt(
        buildInspection(
          crackRun(60, [30], {
            depths: [
              [0, 6],
              [60, 10],
            ],
          }),
        ).runs[0]!,
        feet(30),
      ),
    ).toBe(feet(8));
  });

  it('open-trench replacement restores hard surfaces over the trench length', () => {
    const result = costsOf(crackRun(60, [10, 30, 50], { surfaces: [[40, 60, 'asphalt']] }));
    const trench = option(result.options, 'replace_runs');
    const asphalt = trench.lines.find((l) => l.item === 'surface_asphalt');
    expect(asphalt?.quantity).toBe(40); // 20 ft × 2 ft trench
    expect(asphalt?.lowCents).toBe(40 * 600);
  });

  it('a regional factor multiplies every line', () => {
    const base = option(costsOf(crackRun(60, [20])).options, 'spot_repairs');
    const dear = option(costsOf(crackRun(60, [20]), { ...demoPriceBook, regionalFactor: 1.25 }).options, 'spot_repairs');
    expect(parseExact(dear.exactLow).compare(parseExact(base.exactLow).mul(Exact.of(5, 4)))).toBe(0);
    expect(parseExact(dear.exactHigh).compare(parseExact(base.exactHigh).mul(Exact.of(5, 4)))).toBe(0);
    expect(dear.assumptions.join(' ')).toMatch(/multiplied by 1.25/);
  });

  it('every option states its assumptions and a range, never a single figure', () => {
    const result = costsOf(crackRun(60, [10, 30, 50]));
    expect(result.disclaimer).toMatch(/not quotes/);
    for (const o of result.options) {
      expect(o.assumptions.length).toBeGreaterThan(1);
      expect(formatRange(o)).toMatch(/^\$[\d,]+–\$[\d,]+$/);
    }
  });

  it('nothing to repair gives no options', () => {
    expect(costsOf({ runs: [{ distance: 60, observations: [{ kind: 'crack', at: 10, severity: 2 }] }] }).options).toEqual([]);
  });
});

describe('rounding only at the end', () => {
  it('the total is the exact sum of the exact lines, rounded once outward to $10', () => {
    // 61.3 ft of lining at a 1.07 regional factor: the lines have fractions of a cent
    const result = costsOf(
      crackRun(61.3, [5, 20, 35, 50], {
        observations: [
          ...[5, 20, 35, 50].map((at) => ({ kind: 'open_crack', at, severity: 4 })),
          { kind: 'sag', at: 55, to: 57, severity: 4 },
        ],
      }),
      {
        ...demoPriceBook,
        regionalFactor: 1.07,
      },
    );
    for (const o of result.options) {
      const exactLow = Exact.sum(o.lines.map((l) => parseExact(l.exactLow)));
      const exactHigh = Exact.sum(o.lines.map((l) => parseExact(l.exactHigh)));
      expect(exactLow.toString()).toBe(o.exactLow);
      expect(exactHigh.toString()).toBe(o.exactHigh);
      expect(BigInt(o.lowCents)).toBe(Exact.of(exactLow.numerator, exactLow.denominator * 1000n).floor() * 1000n);
      expect(BigInt(o.highCents)).toBe(Exact.of(exactHigh.numerator, exactHigh.denominator * 1000n).ceil() * 1000n);
    }
    // at least one line is not a whole number of cents, so early rounding would have changed something
    expect(result.options.some((o) => o.lines.some((l) => l.exactLow.includes('/')))).toBe(true);
  });
});

describe('properties (fast-check)', () => {
  const defect: fc.Arbitrary<ObservationSpec> = fc
    .record({
      kind: fc.constantFrom(...defectKinds),
      at: fc.integer({ min: 0, max: 590 }).map((n) => n / 10),
      length: fc.oneof(
        fc.constant(0),
        fc.integer({ min: 1, max: 200 }).map((n) => n / 10),
      ),
      severity: fc.integer({ min: 1, max: 5 }),
    })
    .map(({ kind, at, length, severity }) => (length > 0 ? { kind, at, to: Math.min(60, at + length), severity } : { kind, at, severity }));

  const runSpec = (
    observations: ObservationSpec[],
    surfaces: Array<[number, number, (typeof surfaceKinds)[number]]>,
    depths: Array<[number, number]>,
  ): InspectionSpec => ({
    runs: [{ distance: 60, sections: [[0, 60, 'vitrified_clay', 4]], observations, surfaces, depths }],
  });
  const surfaces = fc
    .array(
      fc.record({ from: fc.integer({ min: 0, max: 50 }), len: fc.integer({ min: 1, max: 10 }), surface: fc.constantFrom(...surfaceKinds) }),
      { maxLength: 3 },
    )
    .map((list) => {
      // non-overlapping stretches, as a person would record them
      const out: Array<[number, number, (typeof surfaceKinds)[number]]> = [];
      let last = -1;
      for (const s of [...list].sort((a, b) => a.from - b.from)) {
        if (s.from <= last) continue;
        out.push([s.from, s.from + s.len, s.surface]);
        last = s.from + s.len;
      }
      return out;
    });
  const depths = fc
    .array(
      fc.integer({ min: 20, max: 120 }).map((d) => d / 10),
      { minLength: 0, maxLength: 4 },
    )
    .map((list) => list.map((depth, i) => [i * 15, depth] as [number, number]));
  const book = fc
    .record({
      regionalFactor: fc.integer({ min: 50, max: 300 }).map((n) => n / 100),
    })
    .map(({ regionalFactor }) => ({ ...demoPriceBook, regionalFactor }));

  it('low ≤ high for every option and every line', () => {
    fc.assert(
      fc.property(fc.array(defect, { maxLength: 10 }), surfaces, depths, book, (list, s, d, b) => {
        for (const o of costsOf(runSpec(list, s, d), b).options) {
          expect(o.lowCents).toBeLessThanOrEqual(o.highCents);
          expect(parseExact(o.exactLow).compare(parseExact(o.exactHigh))).toBeLessThanOrEqual(0);
          for (const l of o.lines) expect(l.lowCents).toBeLessThanOrEqual(l.highCents);
        }
      }),
    );
  });

  it('rounding happens only at the end: each total is its exact line sum, rounded once outward to $10', () => {
    fc.assert(
      fc.property(fc.array(defect, { maxLength: 10 }), surfaces, depths, book, (list, s, d, b) => {
        for (const o of costsOf(runSpec(list, s, d), b).options) {
          const low = Exact.sum(o.lines.map((l) => parseExact(l.exactLow)));
          const high = Exact.sum(o.lines.map((l) => parseExact(l.exactHigh)));
          expect(low.toString()).toBe(o.exactLow);
          expect(high.toString()).toBe(o.exactHigh);
          expect(BigInt(o.lowCents)).toBe(Exact.of(low.numerator, low.denominator * 1000n).floor() * 1000n);
          expect(BigInt(o.highCents)).toBe(Exact.of(high.numerator, high.denominator * 1000n).ceil() * 1000n);
        }
      }),
    );
  });

  it('adding a defect never lowers a total (no option disappears, no exact low or high drops)', () => {
    fc.assert(
      fc.property(fc.array(defect, { maxLength: 10 }), defect, surfaces, depths, book, (list, extra, s, d, b) => {
        const before = costsOf(runSpec(list, s, d), b).options;
        const after = costsOf(runSpec([...list, extra], s, d), b).options;
        for (const o of before) {
          const same = after.find((a) => a.kind === o.kind);
          expect(same, `option ${o.kind} disappeared`).toBeDefined();
          if (!same) continue;
          expect(parseExact(same.exactLow).compare(parseExact(o.exactLow))).toBeGreaterThanOrEqual(0);
          expect(parseExact(same.exactHigh).compare(parseExact(o.exactHigh))).toBeGreaterThanOrEqual(0);
          expect(same.lowCents).toBeGreaterThanOrEqual(o.lowCents);
          expect(same.highCents).toBeGreaterThanOrEqual(o.highCents);
        }
      }),
      { numRuns: 300 },
    );
  }, 60_000); // 300 pairs of inspections: allow for a busy machine
});
