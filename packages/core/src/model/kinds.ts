/**
 * The words of the domain (PRODUCT.md §4), with Underfoot's own plain names.
 * Identifiers are snake_case and ours; names are what people read.
 */

// ---------- observation kinds ----------

/** Damage to the pipe itself. */
export const structuralKinds = [
  'crack',
  'open_crack',
  'missing_piece',
  'out_of_round',
  'collapse',
  'joint_offset',
  'joint_gap',
  'sag',
  'worn_wall',
  'liner_problem',
] as const;

/** Things in or entering the pipe that cleaning or sealing deals with. */
export const serviceKinds = ['roots', 'grease', 'debris', 'scale', 'standing_water', 'blockage', 'seepage'] as const;

/** Fittings and landmarks: no severity. */
export const featureKinds = ['bend', 'branch', 'material_change', 'size_change', 'cleanout', 'main_connection', 'run_end'] as const;

export const defectKinds = [...structuralKinds, ...serviceKinds] as const;
export const observationKinds = [...defectKinds, ...featureKinds] as const;

export type StructuralKind = (typeof structuralKinds)[number];
export type ServiceKind = (typeof serviceKinds)[number];
export type FeatureKind = (typeof featureKinds)[number];
export type DefectKind = (typeof defectKinds)[number];
export type ObservationKind = (typeof observationKinds)[number];

export type KindGroup = 'structural' | 'service' | 'feature';

export interface KindInfo {
  group: KindGroup;
  /** Short name shown on screens: "Joint offset". */
  name: string;
  /** As it reads inside a sentence to a buyer: "a joint offset" / "roots". */
  phrase: string;
  /** Plural phrase for counts: "joint offsets". */
  plural: string;
  /** One plain sentence saying what it is. */
  explanation: string;
  /** Whether it usually runs along the pipe, so an extent (from–to) makes sense. */
  continuous: boolean;
}

export const kindInfo: Record<ObservationKind, KindInfo> = {
  crack: {
    group: 'structural',
    name: 'Crack',
    phrase: 'a crack',
    plural: 'cracks',
    explanation: 'A thin crack in the pipe wall. The pieces are still in place.',
    continuous: true,
  },
  open_crack: {
    group: 'structural',
    name: 'Open crack',
    phrase: 'an open crack',
    plural: 'open cracks',
    explanation: 'A crack that has opened into a gap, so the pieces have begun to move apart.',
    continuous: true,
  },
  missing_piece: {
    group: 'structural',
    name: 'Hole or missing piece',
    phrase: 'a hole in the pipe',
    plural: 'holes in the pipe',
    explanation: 'Part of the pipe wall is gone. At worst, soil can be seen through it.',
    continuous: false,
  },
  out_of_round: {
    group: 'structural',
    name: 'Out-of-round pipe',
    phrase: 'a pipe pressed out of round',
    plural: 'spots where the pipe is pressed out of round',
    explanation: 'The pipe has been squeezed or bent out of its round shape.',
    continuous: true,
  },
  collapse: {
    group: 'structural',
    name: 'Collapsed section',
    phrase: 'a collapsed section',
    plural: 'collapsed sections',
    explanation: 'The pipe has caved in at this spot.',
    continuous: true,
  },
  joint_offset: {
    group: 'structural',
    name: 'Joint offset',
    phrase: 'a joint offset',
    plural: 'joint offsets',
    explanation: 'Two pipe pieces meet out of line at a joint, leaving a lip that can catch waste.',
    continuous: false,
  },
  joint_gap: {
    group: 'structural',
    name: 'Joint gap',
    phrase: 'a joint that has pulled apart',
    plural: 'joints that have pulled apart',
    explanation: 'Two pipe ends have pulled apart at a joint, leaving a gap.',
    continuous: false,
  },
  sag: {
    group: 'structural',
    name: 'Sag holding water',
    phrase: 'a low spot that holds water',
    plural: 'low spots that hold water',
    explanation: 'A dip in the pipe where water sits instead of draining.',
    continuous: true,
  },
  worn_wall: {
    group: 'structural',
    name: 'Worn pipe wall',
    phrase: 'a worn pipe wall',
    plural: 'worn stretches of pipe wall',
    explanation: 'Rust or wear has thinned or roughened the inside of the pipe.',
    continuous: true,
  },
  liner_problem: {
    group: 'structural',
    name: 'Liner problem',
    phrase: 'a problem with an old liner',
    plural: 'problems with an old liner',
    explanation: 'A liner put in by an earlier repair has wrinkled, lifted or split.',
    continuous: true,
  },
  roots: {
    group: 'service',
    name: 'Roots',
    phrase: 'roots',
    plural: 'root growth',
    explanation: 'Tree or shrub roots growing into the pipe, usually through a joint.',
    continuous: true,
  },
  grease: {
    group: 'service',
    name: 'Grease',
    phrase: 'grease build-up',
    plural: 'grease build-up',
    explanation: 'Fat and grease stuck to the pipe wall.',
    continuous: true,
  },
  debris: {
    group: 'service',
    name: 'Debris or sludge',
    phrase: 'debris in the pipe',
    plural: 'debris in the pipe',
    explanation: 'Sludge, grit or waste settled in the bottom of the pipe.',
    continuous: true,
  },
  scale: {
    group: 'service',
    name: 'Scale build-up',
    phrase: 'scale build-up',
    plural: 'scale build-up',
    explanation: 'A hard crust of minerals or rust that narrows the pipe.',
    continuous: true,
  },
  standing_water: {
    group: 'service',
    name: 'Standing water',
    phrase: 'standing water',
    plural: 'standing water',
    explanation: 'Water sitting in the pipe, often from a low spot or a block further down.',
    continuous: true,
  },
  blockage: {
    group: 'service',
    name: 'Blockage',
    phrase: 'a blockage',
    plural: 'blockages',
    explanation: 'Something stuck in the line that stops or slows the flow.',
    continuous: false,
  },
  seepage: {
    group: 'service',
    name: 'Water seeping in',
    phrase: 'water seeping in',
    plural: 'spots where water seeps in',
    explanation: 'Ground water getting into the pipe through a crack or joint.',
    continuous: false,
  },
  bend: {
    group: 'feature',
    name: 'Bend',
    phrase: 'a bend',
    plural: 'bends',
    explanation: 'A fitting that turns the line.',
    continuous: false,
  },
  branch: {
    group: 'feature',
    name: 'Branch line',
    phrase: 'a branch line',
    plural: 'branch lines',
    explanation: 'Another drain joins the line here through a wye or tee fitting.',
    continuous: false,
  },
  material_change: {
    group: 'feature',
    name: 'Material change',
    phrase: 'a change of pipe material',
    plural: 'changes of pipe material',
    explanation: 'The pipe changes from one material to another here.',
    continuous: false,
  },
  size_change: {
    group: 'feature',
    name: 'Size change',
    phrase: 'a change of pipe size',
    plural: 'changes of pipe size',
    explanation: 'The pipe gets wider or narrower here, through a reducer or bushing.',
    continuous: false,
  },
  cleanout: {
    group: 'feature',
    name: 'Cleanout',
    phrase: 'a cleanout',
    plural: 'cleanouts',
    explanation: 'A capped opening used to reach the line for cleaning and cameras.',
    continuous: false,
  },
  main_connection: {
    group: 'feature',
    name: 'Meets the main',
    phrase: 'the joint with the main',
    plural: 'joints with the main',
    explanation: 'Where your line joins the public sewer main.',
    continuous: false,
  },
  run_end: {
    group: 'feature',
    name: 'End of run',
    phrase: 'the end of the run',
    plural: 'ends of runs',
    explanation: 'Where the camera stopped.',
    continuous: false,
  },
};

export const groupOf = (kind: ObservationKind): KindGroup => kindInfo[kind].group;
export const isDefectKind = (kind: ObservationKind): kind is DefectKind => kindInfo[kind].group !== 'feature';
export const isStructuralKind = (kind: ObservationKind): kind is StructuralKind => kindInfo[kind].group === 'structural';
export const isServiceKind = (kind: ObservationKind): kind is ServiceKind => kindInfo[kind].group === 'service';

// ---------- pipe materials ----------

export const materials = [
  'cast_iron',
  'abs',
  'pvc',
  'vitrified_clay',
  'bituminous_fiber',
  'concrete',
  'asbestos_cement',
  'hdpe',
  'unknown',
] as const;
export type Material = (typeof materials)[number];

export const materialNames: Record<Material, string> = {
  cast_iron: 'Cast iron',
  abs: 'ABS plastic',
  pvc: 'PVC plastic',
  vitrified_clay: 'Clay',
  bituminous_fiber: 'Bituminous fiber',
  concrete: 'Concrete',
  asbestos_cement: 'Asbestos-cement',
  hdpe: 'HDPE plastic',
  unknown: 'Unknown material',
};

/** Short labels for the diagram. */
export const materialShortNames: Record<Material, string> = {
  cast_iron: 'Cast iron',
  abs: 'ABS',
  pvc: 'PVC',
  vitrified_clay: 'Clay',
  bituminous_fiber: 'Fiber',
  concrete: 'Concrete',
  asbestos_cement: 'AC',
  hdpe: 'HDPE',
  unknown: 'Unknown',
};

// ---------- access points, runs, ends ----------

export const accessPointKinds = [
  'cleanout_two_way',
  'cleanout_one_way',
  'interior_cleanout',
  'roof_vent',
  'toilet_removed',
  'other',
] as const;
export type AccessPointKind = (typeof accessPointKinds)[number];

export const accessPointNames: Record<AccessPointKind, string> = {
  cleanout_two_way: 'Two-way cleanout',
  cleanout_one_way: 'One-way cleanout',
  interior_cleanout: 'Indoor cleanout',
  roof_vent: 'Roof vent',
  toilet_removed: 'Toilet pulled',
  other: 'Other access',
};

/** How a buyer reads it inside a sentence. */
export const accessPointPhrases: Record<AccessPointKind, string> = {
  cleanout_two_way: 'the cleanout',
  cleanout_one_way: 'the cleanout',
  interior_cleanout: 'the indoor cleanout',
  roof_vent: 'the roof vent',
  toilet_removed: 'a toilet drain',
  other: 'the access point',
};

/** Access points outside the building, where a crew can reach the line without entering the house. */
export const outdoorAccessKinds: readonly AccessPointKind[] = ['cleanout_two_way', 'cleanout_one_way'];

export const runDirections = ['toward_main', 'toward_building'] as const;
export type RunDirection = (typeof runDirections)[number];

export const runDirectionNames: Record<RunDirection, string> = {
  toward_main: 'toward the main',
  toward_building: 'toward the building',
};

export const runEndReasons = ['reached_main', 'reached_building', 'obstruction', 'water', 'camera_blocked', 'other'] as const;
export type RunEndReason = (typeof runEndReasons)[number];

export const runEndReasonNames: Record<RunEndReason, string> = {
  reached_main: 'Reached the main',
  reached_building: 'Reached the building',
  obstruction: 'Something blocked the camera',
  water: 'Too much water to see',
  camera_blocked: 'The camera could not pass',
  other: 'Stopped for another reason',
};

export const propertyTypes = ['single_family', 'townhouse', 'condominium', 'multi_family', 'manufactured', 'commercial', 'other'] as const;
export type PropertyType = (typeof propertyTypes)[number];

export const propertyTypeNames: Record<PropertyType, string> = {
  single_family: 'Single-family house',
  townhouse: 'Townhouse',
  condominium: 'Condominium',
  multi_family: 'Multi-family building',
  manufactured: 'Manufactured home',
  commercial: 'Commercial building',
  other: 'Other',
};

// ---------- feature attributes ----------

/**
 * Bend angles. A bend's name is its fraction of a full turn: angle = fraction × 360°
 * (fitting tables in trade references; IRC 2012 Table P3005.1 names the sixth bend;
 * ASTM A74 lists fifth bends — the fifth bend is from memory).
 */
export const bendAngles = ['deg_11_25', 'deg_22_5', 'deg_45', 'deg_60', 'deg_72', 'deg_90', 'long_sweep'] as const;
export type BendAngle = (typeof bendAngles)[number];

export interface BendInfo {
  name: string;
  degrees: number;
  /** Fraction of a full turn as [numerator, denominator]. */
  fraction: readonly [number, number];
  /** Trade name of the fitting. */
  fitting: string;
}

export const bendInfo: Record<BendAngle, BendInfo> = {
  deg_11_25: { name: '11¼° bend', degrees: 11.25, fraction: [1, 32], fitting: '1/32 bend' },
  deg_22_5: { name: '22½° bend', degrees: 22.5, fraction: [1, 16], fitting: '1/16 bend' },
  deg_45: { name: '45° bend', degrees: 45, fraction: [1, 8], fitting: '1/8 bend' },
  deg_60: { name: '60° bend', degrees: 60, fraction: [1, 6], fitting: '1/6 bend' },
  deg_72: { name: '72° bend', degrees: 72, fraction: [1, 5], fitting: '1/5 bend' },
  deg_90: { name: '90° bend', degrees: 90, fraction: [1, 4], fitting: '1/4 bend' },
  // A long-radius quarter bend: still 90°, turned over a longer radius (common practice, no source).
  long_sweep: { name: 'Long-sweep 90° bend', degrees: 90, fraction: [1, 4], fitting: 'long-sweep 1/4 bend' },
};

export const branchFittings = ['wye', 'tee', 'unknown'] as const;
export type BranchFitting = (typeof branchFittings)[number];

/** A 4×3 closet bend is not a reduction in the direction of flow (IPC 704.2). */
export const sizeChangeFittings = ['reducer', 'bushing', 'increaser', 'closet_bend', 'unknown'] as const;
export type SizeChangeFitting = (typeof sizeChangeFittings)[number];

/** What lies over the pipe, for digging and surface-restoration prices. */
export const surfaceKinds = ['soil', 'concrete', 'asphalt', 'pavers', 'building_slab'] as const;
export type SurfaceKind = (typeof surfaceKinds)[number];

export const surfaceNames: Record<SurfaceKind, string> = {
  soil: 'Lawn or garden soil',
  concrete: 'Concrete',
  asphalt: 'Asphalt',
  pavers: 'Pavers',
  building_slab: 'Floor slab inside the building',
};
