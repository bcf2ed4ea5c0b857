import { z } from 'zod';

/**
 * Markup on a still: arrows, ellipses, boxes and short labels, kept as vector data.
 *
 * Coordinates are fractions of the image (0 = left/top edge, 1 = right/bottom edge),
 * so the same markup fits the display copy, the thumbnail and any later size. The
 * field app draws it live and the server burns it into a rendered copy from the
 * same element list (`layoutMarkup`), so what the inspector drew is what the PDF shows.
 */

/** Bright enough to read on a dark pipe wall; each also has a name, so colour is never the only cue. */
export const markupColours = ['flare', 'sun', 'sky', 'chalk'] as const;
export type MarkupColour = (typeof markupColours)[number];

export const markupColourInfo: Record<MarkupColour, { name: string; hex: string }> = {
  flare: { name: 'Flare orange', hex: '#FF5A36' },
  sun: { name: 'Sun yellow', hex: '#FFD23F' },
  sky: { name: 'Sky blue', hex: '#4CC3FF' },
  chalk: { name: 'Chalk white', hex: '#FFFFFF' },
};

export const markupShapeTypes = ['arrow', 'ellipse', 'box', 'text'] as const;
export type MarkupShapeType = (typeof markupShapeTypes)[number];

export const markupShapeNames: Record<MarkupShapeType, string> = {
  arrow: 'Arrow',
  ellipse: 'Circle',
  box: 'Box',
  text: 'Label',
};

export const MARKUP_MAX_SHAPES = 40;
export const MARKUP_MAX_TEXT = 40;

const fraction = z
  .number({ error: 'A position is a number from 0 to 1.' })
  .min(0, 'Keep the markup on the picture.')
  .max(1, 'Keep the markup on the picture.');

const shapeBase = {
  id: z.string().trim().min(1).max(64),
  colour: z.enum(markupColours, { error: 'Choose a colour.' }),
};

export const arrowShapeSchema = z.object({
  ...shapeBase,
  type: z.literal('arrow'),
  /** The tail. */
  x1: fraction,
  y1: fraction,
  /** The head: what the arrow points at. */
  x2: fraction,
  y2: fraction,
});

const boxFields = {
  x: fraction,
  y: fraction,
  w: fraction,
  h: fraction,
};

const fitsInside = (s: { x: number; y: number; w: number; h: number }) => s.x + s.w <= 1.0001 && s.y + s.h <= 1.0001;

export const ellipseShapeSchema = z
  .object({ ...shapeBase, type: z.literal('ellipse'), ...boxFields })
  .refine(fitsInside, { error: 'Keep the circle on the picture.', path: ['w'] });

export const boxShapeSchema = z
  .object({ ...shapeBase, type: z.literal('box'), ...boxFields })
  .refine(fitsInside, { error: 'Keep the box on the picture.', path: ['w'] });

export const textShapeSchema = z.object({
  ...shapeBase,
  type: z.literal('text'),
  /** Where the label starts (left end of its baseline box, top). */
  x: fraction,
  y: fraction,
  text: z
    .string({ error: 'Write the label.' })
    .trim()
    .min(1, 'Write the label.')
    .max(MARKUP_MAX_TEXT, `Keep labels to ${MARKUP_MAX_TEXT} characters.`)
    // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
    .refine((t) => !/[\u0000-\u001f\u007f]/.test(t), 'A label is one line of plain text.'),
});

export const markupShapeSchema = z.discriminatedUnion('type', [arrowShapeSchema, ellipseShapeSchema, boxShapeSchema, textShapeSchema], {
  error: 'Choose an arrow, circle, box or label.',
});
export type MarkupShape = z.output<typeof markupShapeSchema>;

export const markupSchema = z
  .object({
    shapes: z.array(markupShapeSchema).max(MARKUP_MAX_SHAPES, `At most ${MARKUP_MAX_SHAPES} marks on one still.`).default([]),
  })
  .superRefine((markup, ctx) => {
    const seen = new Set<string>();
    markup.shapes.forEach((shape, index) => {
      if (seen.has(shape.id)) ctx.addIssue({ code: 'custom', message: 'Two marks share one id.', path: ['shapes', index, 'id'] });
      seen.add(shape.id);
    });
  });
export type Markup = z.output<typeof markupSchema>;

// ---------- layout: one element list for the browser and the server ----------

export interface MarkupElement {
  tag: 'line' | 'polygon' | 'ellipse' | 'rect' | 'text';
  /** SVG attributes, already in pixels. */
  attrs: Record<string, string | number>;
  /** Text content for `text` elements. */
  text?: string;
  /** The shape this element draws, for hit-testing and selection. */
  shapeId: string;
}

export interface MarkupSize {
  width: number;
  height: number;
}

const round = (n: number) => Math.round(n * 10) / 10;

/** Line width and label size grow with the picture, so marks read the same on a thumbnail and a full still. */
export function markupMetrics(size: MarkupSize) {
  const base = Math.min(size.width, size.height);
  return {
    stroke: Math.max(2, round(base * 0.012)),
    halo: Math.max(4, round(base * 0.024)),
    fontSize: Math.max(12, round(base * 0.06)),
    headLength: Math.max(10, round(base * 0.05)),
  };
}

/** Dark outline under every mark, so it stays visible on light and dark parts of the picture. */
const HALO = 'rgba(20,24,28,0.6)';

/**
 * The drawable elements for a markup at a given pixel size, in paint order
 * (each shape's dark halo first, then its colour).
 */
export function layoutMarkup(markup: Pick<Markup, 'shapes'>, size: MarkupSize, options: { fontFamily?: string } = {}): MarkupElement[] {
  const { stroke, halo, fontSize, headLength } = markupMetrics(size);
  const font = options.fontFamily ?? 'Inter';
  const elements: MarkupElement[] = [];
  const px = (f: number) => round(f * size.width);
  const py = (f: number) => round(f * size.height);
  for (const shape of markup.shapes) {
    const colour = markupColourInfo[shape.colour].hex;
    const shapeId = shape.id;
    if (shape.type === 'arrow') {
      const x1 = px(shape.x1);
      const y1 = py(shape.y1);
      const x2 = px(shape.x2);
      const y2 = py(shape.y2);
      const angle = Math.atan2(y2 - y1, x2 - x1);
      const spread = Math.PI / 7;
      const left = [x2 - headLength * Math.cos(angle - spread), y2 - headLength * Math.sin(angle - spread)];
      const right = [x2 - headLength * Math.cos(angle + spread), y2 - headLength * Math.sin(angle + spread)];
      // The shaft stops inside the head, so its square end never pokes through the tip.
      const shaftEnd = [x2 - headLength * 0.7 * Math.cos(angle), y2 - headLength * 0.7 * Math.sin(angle)];
      const points = `${x2},${y2} ${round(left[0]!)},${round(left[1]!)} ${round(right[0]!)},${round(right[1]!)}`;
      const line = { x1, y1, x2: round(shaftEnd[0]!), y2: round(shaftEnd[1]!), 'stroke-linecap': 'round' };
      elements.push({ tag: 'line', shapeId, attrs: { ...line, stroke: HALO, 'stroke-width': stroke + halo } });
      elements.push({
        tag: 'polygon',
        shapeId,
        attrs: { points, fill: HALO, stroke: HALO, 'stroke-width': halo, 'stroke-linejoin': 'round' },
      });
      elements.push({ tag: 'line', shapeId, attrs: { ...line, stroke: colour, 'stroke-width': stroke } });
      elements.push({
        tag: 'polygon',
        shapeId,
        attrs: { points, fill: colour, stroke: colour, 'stroke-width': 1, 'stroke-linejoin': 'round' },
      });
    } else if (shape.type === 'ellipse' || shape.type === 'box') {
      const x = px(shape.x);
      const y = py(shape.y);
      const w = Math.max(1, px(shape.w));
      const h = Math.max(1, py(shape.h));
      const geometry: { tag: 'ellipse' | 'rect'; attrs: Record<string, number> } =
        shape.type === 'ellipse'
          ? { tag: 'ellipse' as const, attrs: { cx: round(x + w / 2), cy: round(y + h / 2), rx: round(w / 2), ry: round(h / 2) } }
          : { tag: 'rect' as const, attrs: { x, y, width: w, height: h, rx: round(stroke) } };
      elements.push({
        tag: geometry.tag,
        shapeId,
        attrs: { ...geometry.attrs, fill: 'none', stroke: HALO, 'stroke-width': stroke + halo },
      });
      elements.push({ tag: geometry.tag, shapeId, attrs: { ...geometry.attrs, fill: 'none', stroke: colour, 'stroke-width': stroke } });
    } else {
      const attrs = {
        x: px(shape.x),
        // The label's top sits at y; the baseline is one cap height lower.
        y: round(py(shape.y) + fontSize * 0.8),
        'font-family': font,
        'font-size': fontSize,
        'font-weight': 600,
      };
      elements.push({
        tag: 'text',
        shapeId,
        text: shape.text,
        attrs: { ...attrs, fill: HALO, stroke: HALO, 'stroke-width': halo, 'stroke-linejoin': 'round' },
      });
      elements.push({ tag: 'text', shapeId, text: shape.text, attrs: { ...attrs, fill: colour } });
    }
  }
  return elements;
}

const escapeXml = (text: string) =>
  text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A standalone SVG of the markup alone (transparent background), sized to the picture. */
export function renderMarkupSvg(markup: Pick<Markup, 'shapes'>, size: MarkupSize, options: { fontFamily?: string } = {}): string {
  const body = layoutMarkup(markup, size, options)
    .map((el) => {
      const attrs = Object.entries(el.attrs)
        .map(([name, value]) => `${name}="${escapeXml(String(value))}"`)
        .join(' ');
      return el.tag === 'text' ? `<text ${attrs}>${escapeXml(el.text ?? '')}</text>` : `<${el.tag} ${attrs}/>`;
    })
    .join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${size.width}" height="${size.height}" viewBox="0 0 ${size.width} ${size.height}">${body}</svg>`;
}

/** Words for a screen reader or a caption: "Arrow (Flare orange), Label “Root mass” (Chalk white)". */
export function describeMarkup(markup: Pick<Markup, 'shapes'>): string {
  if (markup.shapes.length === 0) return 'No markup.';
  return markup.shapes
    .map((s) => {
      const colour = markupColourInfo[s.colour].name;
      return s.type === 'text' ? `Label “${s.text}” (${colour})` : `${markupShapeNames[s.type]} (${colour})`;
    })
    .join(', ');
}
