import type { Material } from '../model/kinds.ts';
import type { GradeLevel } from '../model/schemas.ts';

/**
 * Underfoot's colours: warm off-white paper, dark slate ink, a terracotta brand
 * colour and a deep water-blue accent (PRODUCT.md §12). Grade hues run from a calm
 * green to a deep red and always come with a shape and the grade's name.
 */
export const palette = {
  paper: '#FAF6EE',
  ink: '#243041',
  inkMuted: '#566070',
  rule: '#D8D0C0',
  brand: '#B4532A',
  water: '#1F5A85',
  white: '#FFFFFF',
} as const;

export type PinShape = 'circle' | 'square' | 'triangle' | 'diamond' | 'cross';

export interface MarkStyle {
  color: string;
  shape: PinShape;
  /** Words for the shape, for legends and screen readers. */
  shapeName: string;
}

export const gradeStyles: Record<GradeLevel, MarkStyle> = {
  clear: { color: '#2F7A4F', shape: 'circle', shapeName: 'circle' },
  maintain: { color: '#63761A', shape: 'square', shapeName: 'square' },
  plan_repair: { color: '#A35F00', shape: 'triangle', shapeName: 'triangle' },
  repair_now: { color: '#C2410C', shape: 'diamond', shapeName: 'diamond' },
  failing: { color: '#9B1C1C', shape: 'cross', shapeName: 'cross' },
};

/** Severity 1…5 take the grade styles in order, so a severity-4 pin looks like "Repair now". */
export const severityGrade: Record<1 | 2 | 3 | 4 | 5, GradeLevel> = {
  1: 'clear',
  2: 'maintain',
  3: 'plan_repair',
  4: 'repair_now',
  5: 'failing',
};

export const severityStyle = (severity: number): MarkStyle =>
  gradeStyles[severityGrade[Math.min(5, Math.max(1, Math.round(severity))) as 1 | 2 | 3 | 4 | 5]];

/** Section colours by material, each with its own dash pattern so colour is never the only cue. */
export const materialStyles: Record<Material, { color: string; dash: string | null }> = {
  cast_iron: { color: '#4B5563', dash: null },
  abs: { color: '#1F2430', dash: '10 3' },
  pvc: { color: '#1F5A85', dash: null },
  vitrified_clay: { color: '#B4532A', dash: null },
  bituminous_fiber: { color: '#6B4A2E', dash: '6 3' },
  concrete: { color: '#7C7F86', dash: '2 2' },
  asbestos_cement: { color: '#5F7F8C', dash: '8 2 2 2' },
  hdpe: { color: '#2E6B5E', dash: '12 2' },
  unknown: { color: '#9AA0A6', dash: '3 4' },
};

/** WCAG 2.x relative luminance of an sRGB colour like "#AABBCC". */
export function relativeLuminance(hex: string): number {
  const value = hex.replace('#', '');
  const channels = [0, 2, 4].map((i) => parseInt(value.slice(i, i + 2), 16) / 255);
  const [r, g, b] = channels.map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4)) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.x contrast ratio between two colours. */
export function contrastRatio(a: string, b: string): number {
  const la = relativeLuminance(a);
  const lb = relativeLuminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}
