import { describe, expect, it } from 'vitest';
import { describeMarkup, layoutMarkup, markupSchema, renderMarkupSvg } from './markup.ts';

const size = { width: 1600, height: 1200 };

describe('markup', () => {
  it('accepts the four shapes in the named colours, as fractions of the picture', () => {
    const parsed = markupSchema.parse({
      shapes: [
        { id: 'a', type: 'arrow', colour: 'flare', x1: 0.9, y1: 0.9, x2: 0.5, y2: 0.5 },
        { id: 'b', type: 'ellipse', colour: 'sun', x: 0.1, y: 0.1, w: 0.2, h: 0.2 },
        { id: 'c', type: 'box', colour: 'sky', x: 0.5, y: 0.5, w: 0.5, h: 0.5 },
        { id: 'd', type: 'text', colour: 'chalk', x: 0.05, y: 0.05, text: '  Roots at joint ' },
      ],
    });
    expect(parsed.shapes).toHaveLength(4);
    expect(parsed.shapes[3]).toMatchObject({ text: 'Roots at joint' });
  });

  it('refuses marks off the picture, long or multi-line labels, unknown colours and repeated ids', () => {
    const result = markupSchema.safeParse({
      shapes: [
        { id: 'a', type: 'box', colour: 'sky', x: 0.8, y: 0.1, w: 0.5, h: 0.2 },
        { id: 'b', type: 'text', colour: 'chalk', x: 0.1, y: 0.1, text: 'x'.repeat(41) },
        { id: 'c', type: 'text', colour: 'chalk', x: 0.1, y: 0.1, text: 'two\nlines' },
        { id: 'd', type: 'arrow', colour: 'magenta', x1: 0, y1: 0, x2: 1, y2: 1 },
        { id: 'e', type: 'arrow', colour: 'sun', x1: 0, y1: 0, x2: 1.2, y2: 1 },
      ],
    });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['shapes.0.w', 'shapes.1.text', 'shapes.2.text', 'shapes.3.colour', 'shapes.4.x2']));

    const twice = markupSchema.safeParse({
      shapes: [
        { id: 'same', type: 'arrow', colour: 'sun', x1: 0, y1: 0, x2: 1, y2: 1 },
        { id: 'same', type: 'arrow', colour: 'sun', x1: 0, y1: 0, x2: 1, y2: 1 },
      ],
    });
    expect(twice.error?.issues.map((i) => i.path.join('.'))).toEqual(['shapes.1.id']);
  });

  it('lays out pixels from fractions, with a dark halo under every colour', () => {
    const elements = layoutMarkup({ shapes: [{ id: 'b', type: 'box', colour: 'sky', x: 0.25, y: 0.5, w: 0.25, h: 0.25 }] }, size);
    expect(elements).toHaveLength(2);
    expect(elements[0]!.attrs).toMatchObject({ x: 400, y: 600, width: 400, height: 300 });
    expect(String(elements[0]!.attrs.stroke)).toMatch(/^rgba/);
    expect(elements[1]!.attrs.stroke).toBe('#4CC3FF');
  });

  it('points an arrow head at (x2, y2)', () => {
    const elements = layoutMarkup({ shapes: [{ id: 'a', type: 'arrow', colour: 'flare', x1: 0, y1: 0, x2: 0.5, y2: 0.5 }] }, size);
    const head = elements.find((e) => e.tag === 'polygon' && e.attrs.fill === '#FF5A36')!;
    expect(String(head.attrs.points).startsWith('800,600 ')).toBe(true);
  });

  it('escapes label text in the SVG, so a label can never become markup', () => {
    const svg = renderMarkupSvg({ shapes: [{ id: 't', type: 'text', colour: 'chalk', x: 0.1, y: 0.1, text: '<script>&"' }] }, size);
    expect(svg).not.toContain('<script>');
    expect(svg).toContain('&lt;script&gt;&amp;&quot;');
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="1600" height="1200"/);
  });

  it('describes the marks in words', () => {
    expect(describeMarkup({ shapes: [] })).toBe('No markup.');
    expect(
      describeMarkup({
        shapes: [
          { id: 'a', type: 'arrow', colour: 'flare', x1: 0, y1: 0, x2: 1, y2: 1 },
          { id: 't', type: 'text', colour: 'chalk', x: 0.1, y: 0.1, text: 'Crack' },
        ],
      }),
    ).toBe('Arrow (Flare orange), Label “Crack” (Chalk white)');
  });
});
