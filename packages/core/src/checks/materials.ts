import type { Material } from '../model/kinds.ts';

/**
 * What is known about each pipe material in house laterals, for risk notes.
 * Eras and service lives are sanity bands from CHECKS.md ("Pipe materials: eras
 * and service life"): consumer and home-inspector pages, several flagged weak.
 * Roughness n is from the Engineering Toolbox table and FHWA values as adopted in
 * municipal codes (CHECKS.md, read); the value used is the middle or typical one.
 */
export interface MaterialFacts {
  /** First year it was common in house laterals. */
  eraStart: number | null;
  /** Last year it was common; null = still in use. */
  eraEnd: number | null;
  /** Typical service life in years, low–high. */
  lifeYears: readonly [number, number] | null;
  /** Manning roughness used for capacity notes. */
  manningN: number;
  /** Where the numbers come from. */
  source: string;
  /** Known weakness, said plainly. */
  weakness: string | null;
}

export const materialFacts: Record<Material, MaterialFacts> = {
  cast_iron: {
    eraStart: 1900,
    eraEnd: 1975, // "the early 1970s"
    lifeYears: [50, 100],
    manningN: 0.013, // 0.012–0.013
    source: 'CHECKS.md material eras (read, weak); n from Engineering Toolbox / FHWA',
    weakness: 'Rusts from the inside; the bottom of the pipe can wear through, sooner below ground.',
  },
  vitrified_clay: {
    eraStart: 1850, // "1800s to present"
    eraEnd: null,
    lifeYears: [50, 100],
    manningN: 0.014, // 0.013–0.015
    source: 'CHECKS.md material eras (read, weak); n from Engineering Toolbox / FHWA',
    weakness: 'Its many joints let roots in.',
  },
  bituminous_fiber: {
    eraStart: 1945, // "late 1940s"
    eraEnd: 1975, // "early 1970s"
    lifeYears: [30, 50],
    manningN: 0.013, // no value in CHECKS.md: a middle value (common practice, no source)
    source: 'CHECKS.md material eras (read)',
    weakness: 'Softens, blisters and loses its shape with age; known for early failure.',
  },
  abs: {
    eraStart: 1955, // "late 1950s"
    eraEnd: null,
    lifeYears: [50, 50],
    manningN: 0.01, // 0.009–0.011
    source: 'CHECKS.md material eras (home-inspector association article, read); n from Engineering Toolbox / FHWA',
    weakness: null,
  },
  pvc: {
    eraStart: 1970,
    eraEnd: null,
    lifeYears: [50, 50],
    manningN: 0.01, // 0.009–0.011
    source: 'CHECKS.md material eras (read); n from Engineering Toolbox / FHWA',
    weakness: null,
  },
  concrete: {
    eraStart: 1920,
    eraEnd: 1985, // "1920s–1980s"
    lifeYears: [75, 100],
    manningN: 0.013, // 0.011–0.015, 0.013 typical
    source: 'CHECKS.md material eras (read, weak); n from Engineering Toolbox / FHWA',
    weakness: 'Sewer gases can wear the top of the pipe.',
  },
  asbestos_cement: {
    eraStart: 1945, // "mid-1940s"
    eraEnd: 1980, // "late 1970s"
    lifeYears: [50, 70],
    manningN: 0.011,
    source: 'CHECKS.md material eras (read); n from Engineering Toolbox / FHWA',
    weakness: 'Contains asbestos: cutting or breaking it needs trained, licensed handling.',
  },
  hdpe: {
    eraStart: null, // no era data in CHECKS.md
    eraEnd: null,
    lifeYears: null,
    manningN: 0.01, // plastic pipe, taken like PVC (from memory)
    source: 'No era data in CHECKS.md; roughness taken like other plastics (from memory)',
    weakness: null,
  },
  unknown: {
    eraStart: null,
    eraEnd: null,
    lifeYears: null,
    manningN: 0.013, // a middle value (common practice, no source)
    source: 'Unknown material: a middle roughness is assumed (common practice, no source)',
    weakness: null,
  },
};

/** Materials known for early failure (CHECKS.md: bituminous fiber softens, blisters, deforms; 30–50 yr). */
export const earlyFailureMaterials: readonly Material[] = ['bituminous_fiber'];

/** Materials that are a health hazard when cut or broken during a repair (from memory). */
export const hazardousMaterials: readonly Material[] = ['asbestos_cement'];
