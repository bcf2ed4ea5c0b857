import type { DiagramModel, DiagramPin } from './layout.ts';
import { palette, type PinShape } from './palette.ts';

const XML_ENTITIES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' };
const NEEDS_ESCAPE = /[&<>"']/;
const ESCAPE_ALL = /[&<>"']/g;

/** Escape text and attribute values for SVG/XML. */
export function escapeXml(value: string | number): string {
  const text = String(value);
  return NEEDS_ESCAPE.test(text) ? text.replace(ESCAPE_ALL, (ch) => XML_ENTITIES[ch] ?? ch) : text;
}

const f = (n: number) => Math.round(n * 10) / 10;

const FONT = 'Inter, ui-sans-serif, system-ui, sans-serif';

/** A pin's shape centred on (cx, cy), about 12 units across. */
export function shapePath(shape: PinShape, cx: number, cy: number, r = 6): string {
  switch (shape) {
    case 'circle':
      return `<circle cx="${f(cx)}" cy="${f(cy)}" r="${f(r)}"`;
    case 'square':
      return `<rect x="${f(cx - r * 0.9)}" y="${f(cy - r * 0.9)}" width="${f(r * 1.8)}" height="${f(r * 1.8)}"`;
    case 'triangle':
      return `<path d="M${f(cx)} ${f(cy - r * 1.1)}L${f(cx + r * 1.05)} ${f(cy + r * 0.8)}L${f(cx - r * 1.05)} ${f(cy + r * 0.8)}Z"`;
    case 'diamond':
      return `<path d="M${f(cx)} ${f(cy - r * 1.15)}L${f(cx + r * 1.15)} ${f(cy)}L${f(cx)} ${f(cy + r * 1.15)}L${f(cx - r * 1.15)} ${f(cy)}Z"`;
    case 'cross': {
      const a = r * 1.05;
      const w = r * 0.42;
      return `<path d="M${f(cx - a)} ${f(cy - a + w)}L${f(cx - a + w)} ${f(cy - a)}L${f(cx)} ${f(cy - w)}L${f(cx + a - w)} ${f(cy - a)}L${f(cx + a)} ${f(cy - a + w)}L${f(cx + w)} ${f(cy)}L${f(cx + a)} ${f(cy + a - w)}L${f(cx + a - w)} ${f(cy + a)}L${f(cx)} ${f(cy + w)}L${f(cx - a + w)} ${f(cy + a)}L${f(cx - a)} ${f(cy + a - w)}L${f(cx - w)} ${f(cy)}Z"`;
    }
  }
}

export interface SvgOptions {
  /** Prefix for element ids, unique per page (several diagrams can share a page). */
  idPrefix?: string;
  /** Make pins links to `#<prefix>-finding-<observationId>` (for the web page). */
  linkPins?: boolean;
}

function pinSvg(pin: DiagramPin, prefix: string, link: boolean): string {
  const title = `<title>${escapeXml(pin.text)}</title>`;
  const extent =
    pin.extentX !== null
      ? `<rect x="${Math.min(pin.x, pin.extentX)}" y="${pin.lineY - 5}" width="${f(Math.max(1, Math.abs(pin.extentX - pin.x)))}" height="10" fill="${pin.color}" fill-opacity="0.35"/>`
      : '';
  const body =
    `<g class="uf-pin" data-observation-id="${escapeXml(pin.observationId)}" data-severity="${pin.severity}">` +
    (link ? '' : title) +
    extent +
    `<line x1="${pin.x}" y1="${pin.lineY}" x2="${pin.x}" y2="${pin.headY + 6}" stroke="${pin.color}" stroke-width="1.5"/>` +
    `${shapePath(pin.shape, pin.x, pin.headY)} fill="${pin.color}" stroke="#FFFFFF" stroke-width="1"/>` +
    `<text x="${pin.x + 8}" y="${pin.headY + 4}" font-size="10" font-weight="600" fill="${palette.ink}">${pin.number}</text></g>`;
  // a link takes its accessible name from its own <title>
  return link ? `<a href="#${prefix}-finding-${escapeXml(pin.observationId)}">${title}${body}</a>` : body;
}

/** Draw the diagram model as a standalone SVG string: viewBox, title and description, escaped text. */
export function renderDiagramSvg(model: DiagramModel, options: SvgOptions = {}): string {
  const prefix = (options.idPrefix ?? 'uf-diagram').replace(/[^A-Za-z0-9_-]/g, '-');
  // with links inside, the picture is a group of named parts rather than one image
  const role = options.linkPins ? 'group' : 'img';
  const link = options.linkPins ?? false;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${model.width} ${model.height}" width="100%" role="${role}" aria-labelledby="${prefix}-title ${prefix}-desc" font-family="${FONT}" style="max-width:${model.width * 2}px;background:${palette.paper}">`,
    `<title id="${prefix}-title">${escapeXml(model.title)}</title>`,
    `<desc id="${prefix}-desc">${escapeXml(model.description)}</desc>`,
    '<style>.uf-scale text,.uf-pin text{font-variant-numeric:tabular-nums}</style>',
    `<rect x="0" y="0" width="${model.width}" height="${model.height}" fill="${palette.paper}"/>`,
  );

  // the house and the main
  const b = model.building;
  out.push(
    `<g class="uf-building"><rect x="${b.x}" y="${b.y}" width="${b.width}" height="${b.height}" rx="4" fill="${palette.white}" stroke="${palette.ink}" stroke-width="1.5"/>`,
    `<path d="M${b.x + 6} ${b.y + 18}L${b.x + b.width / 2} ${b.y + 6}L${b.x + b.width - 6} ${b.y + 18}" fill="none" stroke="${palette.brand}" stroke-width="2"/>`,
    `<text x="${b.x + b.width / 2}" y="${b.y + 32}" font-size="11" font-weight="600" text-anchor="middle" fill="${palette.ink}">${escapeXml(b.label)}</text></g>`,
  );
  const m = model.main;
  out.push(
    `<g class="uf-main"><rect x="${m.x}" y="${m.y}" width="${m.width}" height="${m.height}" rx="4" fill="${palette.water}" fill-opacity="0.12" stroke="${palette.water}" stroke-width="1.5"/>`,
    `<text x="${m.x + m.width / 2}" y="${m.y + 16}" font-size="11" font-weight="600" text-anchor="middle" fill="${palette.water}">${escapeXml(m.label)}</text>`,
    m.reached
      ? ''
      : `<text x="${m.x + m.width / 2}" y="${m.y + 30}" font-size="9" text-anchor="middle" fill="${palette.inkMuted}"><tspan x="${m.x + m.width / 2}">not</tspan><tspan x="${m.x + m.width / 2}" dy="11">reached</tspan></text>`,
    '</g>',
  );
  if (model.unseenBeforeMain) {
    const u = model.unseenBeforeMain;
    out.push(
      `<line x1="${u.x1}" y1="${u.y}" x2="${u.x2}" y2="${u.y}" stroke="${palette.inkMuted}" stroke-width="2" stroke-dasharray="2 4"><title>Not seen</title></line>`,
    );
  }

  for (const lane of model.lanes) {
    out.push(`<g class="uf-lane" data-access-point-id="${escapeXml(lane.accessPointId)}">`);
    for (const u of lane.unknownStretches) {
      out.push(
        `<line x1="${u.x1}" y1="${u.y}" x2="${u.x2}" y2="${u.y}" stroke="#9AA0A6" stroke-width="4" stroke-dasharray="3 4"><title>No pipe section recorded</title></line>`,
      );
    }
    for (const s of lane.segments) {
      out.push(
        `<g class="uf-section" data-run-id="${escapeXml(s.runId)}"><title>${escapeXml(s.description)}</title>`,
        `<line x1="${s.x1}" y1="${s.y}" x2="${s.x2}" y2="${s.y}" stroke="${s.color}" stroke-width="6"${s.dash ? ` stroke-dasharray="${s.dash}"` : ''}/>`,
        s.label
          ? `<text x="${(s.x1 + s.x2) / 2}" y="${s.y + 16}" font-size="9" text-anchor="middle" fill="${palette.inkMuted}">${escapeXml(s.label)}</text>`
          : '',
        '</g>',
      );
    }
    for (const mark of lane.marks) {
      out.push(
        `<g class="uf-feature" data-observation-id="${escapeXml(mark.observationId)}"><title>${escapeXml(mark.text)}</title>`,
        `<line x1="${mark.x}" y1="${mark.y - 5}" x2="${mark.x}" y2="${mark.y + 5}" stroke="${palette.ink}" stroke-width="1.5"/></g>`,
      );
    }
    for (const end of lane.runEnds) {
      out.push(
        end.reachedTarget
          ? ''
          : `<g class="uf-run-end"><title>${escapeXml(end.text)}</title><line x1="${end.x}" y1="${end.y - 8}" x2="${end.x}" y2="${end.y + 8}" stroke="${palette.ink}" stroke-width="2.5"/></g>`,
      );
    }
    const ap = lane.accessPoint;
    out.push(
      `<g class="uf-access-point" data-access-point-id="${escapeXml(ap.accessPointId)}"><title>${escapeXml(ap.text)}</title>`,
      `<circle cx="${ap.x}" cy="${ap.y}" r="5" fill="${palette.paper}" stroke="${palette.ink}" stroke-width="2"/>`,
      `<text x="${ap.labelX}" y="${ap.y + 26}" font-size="9" text-anchor="${ap.labelAnchor}" fill="${palette.ink}">${escapeXml(ap.label)}</text></g>`,
    );
    for (const pin of lane.pins) out.push(pinSvg(pin, prefix, link));
    out.push('</g>');
  }

  // footage scale
  const sc = model.scale;
  out.push(
    `<g class="uf-scale"><line x1="${sc.x0}" y1="${sc.y}" x2="${sc.x1}" y2="${sc.y}" stroke="${palette.inkMuted}" stroke-width="1"/>`,
  );
  for (const t of sc.ticks) {
    out.push(
      `<line x1="${t.x}" y1="${sc.y - 3}" x2="${t.x}" y2="${sc.y + 3}" stroke="${palette.inkMuted}" stroke-width="1"/>`,
      `<text x="${t.x}" y="${sc.y + 14}" font-size="9" text-anchor="middle" fill="${palette.inkMuted}">${escapeXml(t.label)}</text>`,
    );
  }
  out.push(
    `<text x="${(sc.x0 + sc.x1) / 2}" y="${sc.y + 26}" font-size="9" text-anchor="middle" fill="${palette.inkMuted}">${escapeXml(sc.unitLabel)}</text></g>`,
  );

  // legend
  if (model.legend.length > 0) {
    out.push('<g class="uf-legend">');
    for (const item of model.legend) {
      if (item.kind === 'material') {
        out.push(
          `<line x1="${item.x}" y1="${item.y}" x2="${item.x + 18}" y2="${item.y}" stroke="${item.color}" stroke-width="6"${item.dash ? ` stroke-dasharray="${item.dash}"` : ''}/>`,
        );
      } else if (item.shape) {
        out.push(`${shapePath(item.shape, item.x + 9, item.y, 5)} fill="${item.color}"/>`);
      }
      out.push(`<text x="${item.x + 24}" y="${item.y + 3.5}" font-size="9.5" fill="${palette.ink}">${escapeXml(item.label)}</text>`);
    }
    out.push('</g>');
  }
  out.push('</svg>');
  return out.join('');
}
