import { describe, expect, it } from 'vitest';
import { buildInspection } from '../testing/builders.ts';
import { scenarios } from '../testing/scenarios.ts';
import { gradeLevels } from '../model/schemas.ts';
import { materials } from '../model/kinds.ts';
import { accessPointOffsets, DIAGRAM_WIDTH, findingFromBuilding, layoutDiagram } from './layout.ts';
import { collectFindings } from '../model/findings.ts';
import { contrastRatio, gradeStyles, materialStyles, palette, severityStyle } from './palette.ts';
import { escapeXml, renderDiagramSvg } from './render-svg.ts';
import { feet } from '../footage/footage.ts';

const twoWay = buildInspection({
  yearBuilt: 1955,
  accessPoints: [{ id: 'ap-1', kind: 'cleanout_two_way', locationNote: 'side yard <east> & "gate"' }],
  runs: [
    {
      id: 'main-run',
      direction: 'toward_main',
      distance: 80,
      sections: [
        [0, 30, 'cast_iron', 4],
        [30, 80, 'vitrified_clay', 4],
      ],
      observations: [
        { kind: 'crack', at: 12, severity: 2, id: 'o-crack' },
        { kind: 'roots', at: 33, severity: 3, id: 'o-roots' },
        { kind: 'open_crack', at: 34, severity: 4, id: 'o-open' },
        { kind: 'sag', at: 50, to: 58, severity: 4, id: 'o-sag' },
        { kind: 'bend', at: 40, angle: 'deg_45', id: 'o-bend' },
        { kind: 'main_connection', at: 80, id: 'o-main' },
      ],
    },
    {
      id: 'house-run',
      direction: 'toward_building',
      distance: 9,
      sections: [[0, 9, 'cast_iron', 4]],
      observations: [{ kind: 'scale', at: 4, severity: 5, id: 'o-scale' }],
    },
  ],
});

describe('palette (PRODUCT.md §12)', () => {
  it('ink on paper passes AA for text, 4.5:1 (WCAG 2.1 SC 1.4.3, from memory)', () => {
    expect(contrastRatio(palette.ink, palette.paper)).toBeGreaterThanOrEqual(4.5);
    expect(contrastRatio(palette.inkMuted, palette.paper)).toBeGreaterThanOrEqual(4.5);
    expect(contrastRatio(palette.water, palette.paper)).toBeGreaterThanOrEqual(4.5);
  });

  it('every grade colour stands out from the paper at 3:1 for graphics (WCAG 2.1 SC 1.4.11, from memory)', () => {
    for (const level of gradeLevels) expect(contrastRatio(gradeStyles[level].color, palette.paper)).toBeGreaterThanOrEqual(3);
  });

  it('the five grades have five distinct colours and five distinct shapes, so colour is never the only cue', () => {
    expect(new Set(gradeLevels.map((l) => gradeStyles[l].color)).size).toBe(5);
    expect(new Set(gradeLevels.map((l) => gradeStyles[l].shape)).size).toBe(5);
    expect([1, 2, 3, 4, 5].map((s) => severityStyle(s).shape)).toEqual(['circle', 'square', 'triangle', 'diamond', 'cross']);
  });

  it('materials differ by colour and by dash pattern', () => {
    const keys = materials.map((m) => `${materialStyles[m].color}|${materialStyles[m].dash}`);
    expect(new Set(keys).size).toBe(materials.length);
    expect(new Set(materials.map((m) => materialStyles[m].dash ?? 'solid')).size).toBeGreaterThanOrEqual(6);
  });

  it('WCAG contrast arithmetic: black on white is 21:1', () => {
    expect(contrastRatio('#000000', '#FFFFFF')).toBeCloseTo(21, 6);
  });
});

describe('layout', () => {
  const model = layoutDiagram(twoWay);

  it('places the cleanout as far from the house as the run toward the building reached', () => {
    expect(accessPointOffsets(twoWay).get('ap-1')).toBe(feet(9));
    expect(model.building.x).toBeLessThan(model.lanes[0]!.accessPoint.x);
    expect(model.main.x).toBeGreaterThan(model.lanes[0]!.accessPoint.x);
  });

  it('gives each finding its distance from the house, the diagram scale, beside its footage from the cleanout', () => {
    // The cleanout sits 9 ft out: 12 ft toward the main is 21 ft from the house, 4 ft back toward it is 5 ft.
    const fromHouse = new Map(collectFindings(twoWay).map((f) => [f.observation.id, findingFromBuilding(twoWay, f)]));
    expect(fromHouse.get('o-crack')).toBe(feet(21));
    expect(fromHouse.get('o-sag')).toBe(feet(59));
    expect(fromHouse.get('o-scale')).toBe(feet(5));
  });

  it('pins every finding (not the features) at its footage, with ids to link to the finding', () => {
    const pins = model.lanes.flatMap((l) => l.pins);
    expect(pins.map((p) => p.observationId).sort()).toEqual(['o-crack', 'o-open', 'o-roots', 'o-sag', 'o-scale']);
    expect(pins.map((p) => p.number).sort()).toEqual([1, 2, 3, 4, 5]);
    const scale = pins.find((p) => p.observationId === 'o-scale')!;
    const crack = pins.find((p) => p.observationId === 'o-crack')!;
    // the run toward the building goes left of the cleanout, the run toward the main right
    expect(scale.x).toBeLessThan(model.lanes[0]!.accessPoint.x);
    expect(crack.x).toBeGreaterThan(model.lanes[0]!.accessPoint.x);
    expect(scale.shape).toBe('cross');
    expect(scale.text).toMatch(/Scale build-up, severity 5/);
    const sag = pins.find((p) => p.observationId === 'o-sag')!;
    expect(sag.extentX).toBeGreaterThan(sag.x);
    const marks = model.lanes.flatMap((l) => l.marks);
    expect(marks.map((m) => m.label)).toEqual(['45°', 'Main']);
  });

  it('pins close together are stacked so their heads do not overlap', () => {
    const pins = model.lanes[0]!.pins;
    const roots = pins.find((p) => p.observationId === 'o-roots')!;
    const open = pins.find((p) => p.observationId === 'o-open')!;
    expect(Math.abs(roots.x - open.x)).toBeLessThan(16);
    expect(roots.headY).not.toBe(open.headY);
  });

  it('sections are coloured by material along the line; the scale starts at the house', () => {
    const lane = model.lanes[0]!;
    expect(lane.segments.map((s) => s.material)).toEqual(['cast_iron', 'vitrified_clay', 'cast_iron']);
    expect(model.scale.ticks[0]?.label).toBe('0');
    expect(model.scale.ticks.length).toBeGreaterThanOrEqual(3);
    expect(model.legend.map((l) => l.label)).toEqual(expect.arrayContaining(['Cast iron', 'Clay', 'Severity 5']));
  });

  it('everything fits the 360-unit width', () => {
    expect(model.width).toBe(DIAGRAM_WIDTH);
    for (const lane of model.lanes) {
      for (const s of lane.segments) expect(s.x2).toBeLessThanOrEqual(DIAGRAM_WIDTH);
      for (const p of lane.pins) {
        expect(p.x).toBeGreaterThanOrEqual(0);
        expect(p.x + 16).toBeLessThanOrEqual(DIAGRAM_WIDTH);
        expect(p.headY).toBeGreaterThan(0);
      }
    }
    for (const item of model.legend) expect(item.x).toBeLessThan(DIAGRAM_WIDTH);
  });

  it('a line that never reached the main shows the unseen stretch', () => {
    const failing = layoutDiagram(buildInspection(scenarios.find((s) => s.expected === 'failing')!.spec));
    expect(failing.main.reached).toBe(false);
    expect(failing.unseenBeforeMain).not.toBeNull();
    expect(failing.description).toMatch(/did not reach the main/);
  });

  it('metric scale is labelled in metres', () => {
    expect(layoutDiagram(twoWay, { units: 'metric' }).scale.unitLabel).toBe('m from the house');
  });

  it('an empty inspection still lays out', () => {
    const empty = layoutDiagram(buildInspection({ runs: [] }));
    expect(empty.lanes).toHaveLength(1);
    expect(empty.height).toBeGreaterThan(50);
  });
});

describe('SVG', () => {
  const svg = renderDiagramSvg(layoutDiagram(twoWay), { idPrefix: 'report-1', linkPins: true });

  it('is a standalone SVG with a viewBox, an accessible title and description', () => {
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 360 ')).toBe(true);
    // linked pins make it a group of named parts; a plain picture is one image
    expect(svg).toContain('role="group"');
    expect(renderDiagramSvg(layoutDiagram(twoWay))).toContain('role="img"');
    expect(svg).toContain('aria-labelledby="report-1-title report-1-desc"');
    expect(svg).toMatch(/<title id="report-1-title">Sewer line diagram<\/title>/);
    expect(svg).toMatch(/<desc id="report-1-desc">The sewer line from the house/);
    expect(svg.endsWith('</svg>')).toBe(true);
  });

  it('escapes every piece of text, including what inspectors type', () => {
    expect(escapeXml(`<a href="x">'&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&apos;&amp;&apos;&lt;/a&gt;');
    expect(svg).toContain('side yard &lt;east&gt; &amp; &quot;gate&quot;');
    expect(svg).not.toContain('<east>');
    // footage inch marks are escaped inside titles
    expect(svg).toContain(`at 12&apos; 0&quot; toward the main`);
  });

  it('links each pin to its finding by observation id', () => {
    expect(svg).toContain('href="#report-1-finding-o-open"');
    expect(svg).toContain('data-observation-id="o-open"');
  });

  it('is well-formed enough to parse: tags balance', () => {
    const opens = (svg.match(/<(g|a|svg|text|title|desc)[\s>]/g) ?? []).length;
    const closes = (svg.match(/<\/(g|a|svg|text|title|desc)>/g) ?? []).length;
    expect(opens).toBe(closes);
  });
});
