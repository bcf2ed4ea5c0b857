/**
 * Core analysis speed: grading, recommendations, costing, slope, checks, summary,
 * cautions and the diagram for an inspection with 300 observations, as a ratio to
 * parsing the same inspection with its zod schema (the floor). Target: ≤ 3×.
 */
import { performance } from 'node:perf_hooks';
import {
  analyseInspection,
  defectKinds,
  demoPriceBook,
  feet,
  inspectionSchema,
  layoutDiagram,
  renderDiagramSvg,
  type InspectionInput,
  type ObservationInput,
} from '@underfoot/core';

const TARGET_RATIO = 3;
const OBSERVATIONS = 300;

/** A deterministic pseudo-random sequence (mulberry32), so every run measures the same inspection. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** An invented inspection: two access points, four runs, 300 observations of every kind. */
export function buildBenchInspection(count = OBSERVATIONS): InspectionInput {
  const next = random(42);
  const runLengths = [120, 20, 90, 15];
  const runs = runLengths.map((length, r) => ({
    id: `run-${r + 1}`,
    accessPointId: r < 2 ? 'ap-1' : 'ap-2',
    direction: r % 2 === 0 ? ('toward_main' as const) : ('toward_building' as const),
    distanceReached: feet(length),
    endReason: r % 2 === 0 ? ('reached_main' as const) : ('reached_building' as const),
    sections: [
      { id: `run-${r + 1}-s1`, from: 0, to: feet(length / 2), material: 'cast_iron' as const, diameterIn: 4 },
      { id: `run-${r + 1}-s2`, from: feet(length / 2), to: feet(length), material: 'vitrified_clay' as const, diameterIn: 4 },
    ],
    observations: [] as ObservationInput[],
    depthReadings: Array.from({ length: 6 }, (_, i) => ({ at: feet((length / 5) * i), depth: feet(3 + next() * 4) })),
    surfaces: [{ from: feet(length * 0.6), to: feet(length * 0.8), surface: 'concrete' as const }],
  }));
  for (let i = 0; i < count; i += 1) {
    const r = i % runs.length;
    const run = runs[r]!;
    const length = runLengths[r]!;
    const at = feet(next() * (length - 3));
    const roll = next();
    let obs: ObservationInput;
    if (roll < 0.15) obs = { id: `o${i}`, kind: 'bend', at, angle: 'deg_45' };
    else if (roll < 0.2) obs = { id: `o${i}`, kind: 'branch', at, fitting: 'wye' };
    else if (roll < 0.22) obs = { id: `o${i}`, kind: 'size_change', at, fromSize: 4, toSize: 4, fitting: 'reducer' };
    else {
      const kind = defectKinds[Math.floor(next() * defectKinds.length)]!;
      const severity = 1 + Math.floor(next() * 5);
      const extent = next() < 0.2 ? { to: Math.min(at + feet(2 + next() * 6), run.distanceReached) } : {};
      obs = { id: `o${i}`, kind, at, severity, clock: 1 + Math.floor(next() * 12), note: 'Seen on the way out.', ...extent };
    }
    run.observations.push(obs);
  }
  return {
    id: 'bench-inspection',
    property: { yearBuilt: 1958, type: 'single_family' },
    accessPoints: [
      { id: 'ap-1', kind: 'cleanout_two_way', locationNote: 'front yard' },
      { id: 'ap-2', kind: 'cleanout_one_way', locationNote: 'side yard' },
    ],
    runs,
    checkedNotFound: [],
    gradeOverride: null,
  };
}

/** Milliseconds per call over one timed batch. */
function time(fn: () => unknown, iterations: number): number {
  const start = performance.now();
  for (let i = 0; i < iterations; i += 1) fn();
  return (performance.now() - start) / iterations;
}

const median = (values: number[]) => [...values].sort((x, y) => x - y)[Math.floor(values.length / 2)] ?? Number.NaN;

/**
 * Batches of each candidate alternate with batches of the floor, so a busy machine
 * slows both alike; the ratio is the median of the per-round ratios.
 */
function compare(floor: () => unknown, candidates: Record<string, () => unknown>, iterations = 40, rounds = 15) {
  for (let i = 0; i < 50; i += 1) {
    floor();
    for (const fn of Object.values(candidates)) fn();
  }
  const floorTimes: number[] = [];
  const results: Record<string, { times: number[]; ratios: number[] }> = {};
  for (const name of Object.keys(candidates)) results[name] = { times: [], ratios: [] };
  for (let r = 0; r < rounds; r += 1) {
    for (const [name, fn] of Object.entries(candidates)) {
      const base = time(floor, iterations);
      const t = time(fn, iterations);
      floorTimes.push(base);
      results[name]!.times.push(t);
      results[name]!.ratios.push(t / base);
    }
  }
  return {
    floor: median(floorTimes),
    candidates: Object.fromEntries(Object.entries(results).map(([name, r]) => [name, { ms: median(r.times), ratio: median(r.ratios) }])),
  };
}

export async function benchCore(): Promise<void> {
  const input = buildBenchInspection();
  const parsed = inspectionSchema.parse(input);
  const observations = parsed.runs.reduce((n, run) => n + run.observations.length, 0);

  const result = compare(() => inspectionSchema.parse(input), {
    analysis: () => analyseInspection(parsed, demoPriceBook, { currentYear: 2025 }),
    analysisWithSvg: () => renderDiagramSvg(analyseInspection(parsed, demoPriceBook, { currentYear: 2025 }).diagram),
    diagramOnly: () => renderDiagramSvg(layoutDiagram(parsed)),
  });
  const { analysis, analysisWithSvg, diagramOnly } = result.candidates as Record<string, { ms: number; ratio: number }>;
  if (!analysis || !analysisWithSvg || !diagramOnly) throw new Error('missing measurement');
  const ratio = analysis.ratio;
  const fmt = (ms: number) => `${(ms * 1000).toFixed(0).padStart(6)} µs`;
  console.log(`inspection: ${observations} observations on ${parsed.runs.length} runs (medians of interleaved rounds)`);
  console.log(`zod parse (floor)             ${fmt(result.floor)}   1.00×`);
  console.log(
    `full analysis                 ${fmt(analysis.ms)}   ${ratio.toFixed(2)}×  (target ≤ ${TARGET_RATIO}×: ${ratio <= TARGET_RATIO ? 'met' : 'NOT met'})`,
  );
  console.log(`full analysis + SVG render    ${fmt(analysisWithSvg.ms)}   ${analysisWithSvg.ratio.toFixed(2)}×`);
  console.log(`diagram layout + SVG alone    ${fmt(diagramOnly.ms)}   ${diagramOnly.ratio.toFixed(2)}×`);
}
