import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import {
  accessPointOffsets,
  collectFindings,
  findingFromBuilding,
  formatCents,
  formatFootage,
  glossaryFor,
  gradeGuidance,
  gradeInfo,
  gradeStyles,
  kindInfo,
  palette,
  recommendationInfo,
  renderDiagramSvg,
  runLabel,
  severityScale,
  severityStyle,
  sourceForReaders,
  urgencyNames,
  type PinShape,
  type RevisionComparison,
  type Side,
} from '@underfoot/core';
import type { ReportSnapshot } from './reports.repo.ts';

// Text drawn by sharp (the diagram) needs the shipped fonts and their fontconfig file (STACK.md trap 8).
const fontsDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../assets/fonts');
process.env.FONTCONFIG_FILE ??= path.join(fontsDir, 'fonts.conf');

// The same family as the web app, embedded and subset by pdfkit (STACK.md trap 9).
const require = createRequire(import.meta.url);
const INTER_REGULAR = require.resolve('@expo-google-fonts/inter/400Regular/Inter_400Regular.ttf');
const INTER_SEMIBOLD = require.resolve('@expo-google-fonts/inter/600SemiBold/Inter_600SemiBold.ttf');

export interface PdfRevision {
  number: number;
  kind: 'original' | 'amendment' | 'reinspection';
  note: string;
  publishedAt: string;
  snapshot: ReportSnapshot;
  costsHidden: boolean;
}

export interface PdfInput {
  revision: PdfRevision;
  changes: RevisionComparison | null;
  /** The reader's side, for "what this means for you"; null reads as the ordering side. */
  readerSide: Side | null;
}

/** Stills are downscaled for print: sharp at 150 dpi over a half-page width keeps a 20-still report to a few MB. */
const STILL_MAX_WIDTH_PX = 900;
const STILL_JPEG_QUALITY = 70;

const MARGIN = 54;
const PAGE = { width: 612, height: 792 }; // US Letter in points
const CONTENT_WIDTH = PAGE.width - 2 * MARGIN;
const FOOTER_Y = PAGE.height - 36;

const kindNames: Record<PdfRevision['kind'], string> = { original: 'Report', amendment: 'Amended report', reinspection: 'Re-inspection' };

const dateText = (iso: string | null) =>
  iso
    ? new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso).toLocaleDateString('en-US', {
        year: 'numeric',
        month: 'long',
        day: 'numeric',
        timeZone: 'UTC',
      })
    : '—';

type Doc = PDFKit.PDFDocument;

function shape(doc: Doc, kind: PinShape, cx: number, cy: number, r: number, color: string) {
  doc.save().fillColor(color);
  switch (kind) {
    case 'circle':
      doc.circle(cx, cy, r).fill();
      break;
    case 'square':
      doc.rect(cx - r * 0.9, cy - r * 0.9, r * 1.8, r * 1.8).fill();
      break;
    case 'triangle':
      doc.polygon([cx, cy - r * 1.1], [cx + r * 1.05, cy + r * 0.8], [cx - r * 1.05, cy + r * 0.8]).fill();
      break;
    case 'diamond':
      doc.polygon([cx, cy - r * 1.15], [cx + r * 1.15, cy], [cx, cy + r * 1.15], [cx - r * 1.15, cy]).fill();
      break;
    case 'cross': {
      const w = r * 0.42;
      const a = r * 1.05;
      doc.lineWidth(w * 1.6).strokeColor(color);
      doc
        .moveTo(cx - a + w, cy - a + w)
        .lineTo(cx + a - w, cy + a - w)
        .stroke();
      doc
        .moveTo(cx + a - w, cy - a + w)
        .lineTo(cx - a + w, cy + a - w)
        .stroke();
      break;
    }
  }
  doc.restore();
}

async function downscale(bytes: Buffer): Promise<Buffer | null> {
  try {
    return await sharp(bytes)
      .rotate()
      .resize({ width: STILL_MAX_WIDTH_PX, withoutEnlargement: true })
      .jpeg({ quality: STILL_JPEG_QUALITY, mozjpeg: true })
      .toBuffer();
  } catch {
    return null;
  }
}

/**
 * The report as a PDF: the same content as the web page, in the same order (grade, summary,
 * diagram, findings with their marked-up stills, repair options, what was checked, notes,
 * cautions, glossary, the company), with page numbers on every page.
 */
export async function renderReportPdf(input: PdfInput, loadImage: (mediaId: string) => Promise<Buffer | null>): Promise<Buffer> {
  const { revision, changes } = input;
  const snap = revision.snapshot;
  const { analysis, inspection } = snap;
  const grade = analysis.grade;
  const side = input.readerSide ?? snap.orderingSide;

  // Work that waits on other things first: the diagram picture and every still, in parallel.
  const diagramSvg = renderDiagramSvg(analysis.diagram, { idPrefix: 'pdf' });
  const diagramPng = sharp(Buffer.from(diagramSvg), { density: 216 }).png({ compressionLevel: 9, palette: true }).toBuffer();
  const stillIdsByObservation = new Map<string, string[]>();
  for (const run of inspection.runs) for (const o of run.observations) if (o.stillIds.length) stillIdsByObservation.set(o.id, o.stillIds);
  const mediaById = new Map(snap.media.map((m) => [m.id, m]));
  const pictures = new Map<string, Promise<Buffer | null>>();
  for (const ids of stillIdsByObservation.values()) {
    for (const id of ids.slice(0, 2)) {
      const m = mediaById.get(id);
      if (!m) continue;
      pictures.set(
        id,
        loadImage(m.renderedId ?? m.id).then((b) => (b ? downscale(b) : null)),
      );
    }
  }

  const doc = new PDFDocument({
    size: 'LETTER',
    margins: { top: MARGIN, bottom: MARGIN + 18, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: `Sewer line report: ${snap.property.address}`, Author: snap.company.name, Subject: 'Sewer line camera inspection' },
  });
  doc.registerFont('regular', INTER_REGULAR);
  doc.registerFont('bold', INTER_SEMIBOLD);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<void>((resolve, reject) => {
    doc.on('end', () => resolve());
    doc.on('error', reject);
  });

  const bottom = () => PAGE.height - MARGIN - 18;
  const ensure = (height: number) => {
    if (doc.y + height > bottom()) doc.addPage();
  };
  const body = (text: string, options: PDFKit.Mixins.TextOptions = {}) =>
    doc
      .font('regular')
      .fontSize(10.5)
      .fillColor(palette.ink)
      .text(text, MARGIN, doc.y, { width: CONTENT_WIDTH, lineGap: 2, ...options });
  const muted = (text: string, options: PDFKit.Mixins.TextOptions = {}) =>
    doc
      .font('regular')
      .fontSize(9)
      .fillColor(palette.inkMuted)
      .text(text, MARGIN, doc.y, { width: CONTENT_WIDTH, lineGap: 1.5, ...options });
  const heading = (text: string) => {
    ensure(60);
    doc.moveDown(0.8);
    doc.font('bold').fontSize(14).fillColor(palette.ink).text(text, MARGIN, doc.y, { width: CONTENT_WIDTH });
    const y = doc.y + 2;
    doc
      .save()
      .moveTo(MARGIN, y)
      .lineTo(MARGIN + CONTENT_WIDTH, y)
      .lineWidth(0.75)
      .strokeColor(palette.rule)
      .stroke()
      .restore();
    doc.y = y + 6;
  };
  const bullet = (text: string) => {
    ensure(24);
    const y = doc.y;
    doc
      .font('regular')
      .fontSize(10.5)
      .fillColor(palette.brand)
      .text('•', MARGIN + 2, y);
    doc.fillColor(palette.ink).text(text, MARGIN + 14, y, { width: CONTENT_WIDTH - 14, lineGap: 2 });
    doc.moveDown(0.2);
  };

  // ---------- the letterhead and the grade ----------
  doc.font('bold').fontSize(11).fillColor(palette.brand).text(snap.company.name, MARGIN, MARGIN);
  doc
    .font('bold')
    .fontSize(20)
    .fillColor(palette.ink)
    .text('Sewer line camera report', MARGIN, doc.y + 4);
  doc.font('regular').fontSize(12).text(snap.property.address, { width: CONTENT_WIDTH });
  muted(
    [
      `Inspected ${dateText(snap.inspectedOn)}${snap.inspector ? ` by ${snap.inspector.name}` : ''}`,
      `${kindNames[revision.kind]}${revision.number > 1 ? `, revision ${revision.number}` : ''}, published ${dateText(revision.publishedAt)}`,
      `${snap.property.propertyType}, built ${snap.property.yearBuilt}`,
    ].join('  ·  '),
  );
  doc.moveDown(1);

  const style = gradeStyles[grade.level];
  const boxTop = doc.y;
  const guidance = gradeGuidance[side][grade.level];
  doc.font('regular').fontSize(10.5);
  const guidanceHeight = doc.heightOfString(guidance, { width: CONTENT_WIDTH - 60, lineGap: 2 });
  const meaningHeight = doc.heightOfString(`${grade.meaning} ${grade.action}`, { width: CONTENT_WIDTH - 60 });
  // Label and grade name (about 48 pt), the meaning, the guidance, and room below.
  const boxHeight = 48 + meaningHeight + 4 + guidanceHeight + 14;
  doc.save().roundedRect(MARGIN, boxTop, CONTENT_WIDTH, boxHeight, 6).lineWidth(2).fillAndStroke(palette.white, style.color).restore();
  shape(doc, style.shape, MARGIN + 26, boxTop + 28, 11, style.color);
  doc
    .font('regular')
    .fontSize(9)
    .fillColor(palette.inkMuted)
    .text('CONDITION GRADE', MARGIN + 48, boxTop + 12, { characterSpacing: 0.6 });
  doc
    .font('bold')
    .fontSize(18)
    .fillColor(palette.ink)
    .text(`${grade.name}  (${gradeInfo[grade.level].rank} of 5)`, MARGIN + 48, boxTop + 24);
  doc
    .font('regular')
    .fontSize(10.5)
    .fillColor(palette.ink)
    .text(`${grade.meaning} ${grade.action}`, MARGIN + 48, doc.y + 2, { width: CONTENT_WIDTH - 60 });
  doc.text(guidance, MARGIN + 48, doc.y + 4, { width: CONTENT_WIDTH - 60, lineGap: 2 });
  doc.y = boxTop + boxHeight + 8;
  if (grade.override) {
    muted(`The inspector set this grade; the findings alone give ${gradeInfo[grade.computedLevel].name}. Reason: ${grade.override.reason}`);
  }

  heading('In short');
  body(analysis.summary.text);
  if (grade.drivers.length > 0 && grade.computedLevel !== 'clear') {
    doc.moveDown(0.4);
    doc.font('bold').fontSize(10.5).fillColor(palette.ink).text('Why this grade', MARGIN, doc.y);
    for (const d of grade.drivers.slice(0, 6)) bullet(d.text);
  }

  if (changes) {
    heading(revision.kind === 'reinspection' ? 'What changed since the last inspection' : 'What changed in this revision');
    if (revision.note) body(revision.note);
    body(changes.gradeText);
    for (const c of changes.changes) bullet(c.text);
    if (changes.changes.length === 0) muted('No findings were added, removed or changed in severity.');
  }

  // ---------- the diagram ----------
  heading('Your line from the house to the main');
  const diagramHeight = (CONTENT_WIDTH * analysis.diagram.height) / analysis.diagram.width;
  ensure(diagramHeight + 20);
  doc.image(await diagramPng, MARGIN, doc.y, { width: CONTENT_WIDTH });
  doc.y += diagramHeight + 4;
  muted('Numbered marks are the findings below, at their distance from the access point. The shape and colour give the severity.');

  // ---------- findings ----------
  const findings = collectFindings(inspection);
  const pins = analysis.diagram.lanes.flatMap((l) => l.pins);
  const numberOf = new Map(pins.map((p) => [p.observationId, p.number]));
  const recByObservation = new Map(analysis.recommendations.findings.map((r) => [r.observationIds[0], r]));
  findings.sort((a, b) => (numberOf.get(a.observation.id) ?? 999) - (numberOf.get(b.observation.id) ?? 999));
  heading(`What the camera found (${findings.length})`);
  if (findings.length === 0) body('The camera found no defects in the pipe.');
  const offsets = accessPointOffsets(inspection);
  for (const f of findings) {
    const o = f.observation;
    const sev = severityStyle(o.severity);
    const stills = (stillIdsByObservation.get(o.id) ?? []).slice(0, 2);
    ensure(stills.length ? 250 : 70);
    const top = doc.y + 4;
    shape(doc, sev.shape, MARGIN + 8, top + 8, 6, sev.color);
    doc
      .font('bold')
      .fontSize(11.5)
      .fillColor(palette.ink)
      .text(`${numberOf.get(o.id) ?? '–'}. ${kindInfo[o.kind].name}`, MARGIN + 22, top, { width: CONTENT_WIDTH - 22 });
    const scale = severityScale.find((s) => s.severity === o.severity);
    const where = f.end > f.start ? `from ${formatFootage(f.start)} to ${formatFootage(f.end)}` : `at ${formatFootage(f.start)}`;
    doc
      .font('regular')
      .fontSize(9.5)
      .fillColor(palette.inkMuted)
      .text(
        `Severity ${o.severity} of 5 (${scale?.name ?? ''}) · ${where} ${runLabel(f.run, f.accessPoint)} · ` +
          `${formatFootage(findingFromBuilding(inspection, f, offsets))} from the house`,
        MARGIN + 22,
        doc.y,
        { width: CONTENT_WIDTH - 22 },
      );
    doc
      .font('regular')
      .fontSize(10)
      .fillColor(palette.ink)
      .text(kindInfo[o.kind].explanation, MARGIN + 22, doc.y + 2, { width: CONTENT_WIDTH - 22 });
    if (o.note) doc.text(`Inspector’s note: ${o.note}`, MARGIN + 22, doc.y + 2, { width: CONTENT_WIDTH - 22 });
    const rec = recByObservation.get(o.id);
    if (rec) {
      doc
        .font('bold')
        .text(`${rec.name}: `, MARGIN + 22, doc.y + 2, { width: CONTENT_WIDTH - 22, continued: true })
        .font('regular')
        .text(`${rec.text} (${urgencyNames[rec.urgency].toLowerCase()})`);
    }
    doc.moveDown(0.4);
    const images = (await Promise.all(stills.map((id) => pictures.get(id) ?? Promise.resolve(null)))).filter(
      (b): b is Buffer => b !== null,
    );
    if (images.length > 0) {
      const w = (CONTENT_WIDTH - 22 - 10) / 2;
      const h = (w * 3) / 4;
      ensure(h + 10);
      const y = doc.y;
      images.forEach((img, i) => {
        doc.image(img, MARGIN + 22 + i * (w + 10), y, { fit: [w, h] });
      });
      doc.y = y + h + 6;
    }
    doc.moveDown(0.4);
  }

  // ---------- what to do, and what it may cost ----------
  if (analysis.recommendations.line.length > 0) {
    heading('What we recommend');
    for (const r of analysis.recommendations.line) {
      ensure(40);
      doc
        .font('bold')
        .fontSize(10.5)
        .fillColor(palette.ink)
        .text(`${r.name} — ${urgencyNames[r.urgency]}`, MARGIN, doc.y, { width: CONTENT_WIDTH });
      body(`${r.text} ${recommendationInfo[r.kind].explanation}`);
      doc.moveDown(0.3);
    }
  }

  if (!revision.costsHidden && analysis.costs.options.length > 0) {
    heading('Repair options and cost ranges');
    muted(analysis.costs.disclaimer);
    for (const option of analysis.costs.options) {
      ensure(90);
      doc.moveDown(0.5);
      const y = doc.y;
      doc
        .font('bold')
        .fontSize(11.5)
        .fillColor(palette.ink)
        .text(`${option.name}${option.proposed ? '  (proposed)' : ''}`, MARGIN, y, { width: CONTENT_WIDTH - 150 });
      doc
        .font('bold')
        .fontSize(11.5)
        .text(`${formatCents(option.lowCents)} – ${formatCents(option.highCents)}`, MARGIN + CONTENT_WIDTH - 150, y, {
          width: 150,
          align: 'right',
        });
      doc.y = Math.max(doc.y, y + 16);
      muted(option.description);
      doc.moveDown(0.2);
      for (const line of option.lines) {
        ensure(16);
        const ly = doc.y;
        doc
          .font('regular')
          .fontSize(9)
          .fillColor(palette.ink)
          .text(`${line.label} (${line.quantityText})`, MARGIN + 10, ly, { width: CONTENT_WIDTH - 170 });
        const after = doc.y;
        doc.text(
          `${formatCents(line.lowCents, { cents: false })} – ${formatCents(line.highCents, { cents: false })}`,
          MARGIN + CONTENT_WIDTH - 150,
          ly,
          { width: 150, align: 'right' },
        );
        doc.y = Math.max(after, doc.y) + 1;
      }
      if (option.assumptions.length > 0) {
        doc.moveDown(0.2);
        for (const a of option.assumptions) muted(`– ${a}`, { indent: 10 });
      }
    }
  } else if (revision.costsHidden) {
    heading('Repair costs');
    body('Cost ranges are not included in this copy of the report.');
  }

  // ---------- checked and fine; notes ----------
  heading('What was checked and found fine');
  if (inspection.checkedNotFound.length > 0) {
    body(
      `The inspector looked for these and did not see them: ${inspection.checkedNotFound.map((k) => kindInfo[k].name.toLowerCase()).join(', ')}.`,
    );
  } else {
    body('The inspector did not list conditions that were looked for and not seen.');
  }
  const seen = inspection.runs.reduce((sum, r) => sum + r.distanceReached, 0);
  body(`The camera saw ${formatFootage(seen)} of pipe in ${inspection.runs.length} run${inspection.runs.length === 1 ? '' : 's'}.`);

  const slopeNotes = analysis.slope.runs.flatMap((r) => r.notes.map((n) => `${r.label}: ${n}`));
  if (analysis.checks.length > 0 || slopeNotes.length > 0) {
    heading('Slope, code and pipe notes');
    for (const c of analysis.checks) {
      ensure(40);
      doc.font('bold').fontSize(10.5).fillColor(palette.ink).text(c.title, MARGIN, doc.y, { width: CONTENT_WIDTH });
      body(c.text);
      const source = sourceForReaders(c.source);
      if (source) muted(`Source: ${source}`);
      doc.moveDown(0.3);
    }
    for (const n of slopeNotes) bullet(n);
    if (slopeNotes.length > 0) muted(`${analysis.slope.caveat} ${analysis.slope.upcNote}`);
  }

  // ---------- cautions, glossary, about ----------
  heading('Please read: cautions');
  for (const c of analysis.cautions.filter((x) => x.places.includes('pdf'))) {
    ensure(40);
    doc.font('bold').fontSize(10.5).fillColor(palette.ink).text(c.title, MARGIN, doc.y, { width: CONTENT_WIDTH });
    body(c.text);
    doc.moveDown(0.3);
  }

  heading('Words used in this report');
  for (const g of glossaryFor(inspection, analysis)) {
    ensure(30);
    doc
      .font('bold')
      .fontSize(10)
      .fillColor(palette.ink)
      .text(`${g.term}: `, MARGIN, doc.y, { width: CONTENT_WIDTH, continued: true, lineGap: 2 });
    doc.font('regular').text(g.definition);
    doc.moveDown(0.2);
  }

  heading('About this inspection');
  body(
    [snap.company.name, snap.company.licenceNumber ? `Licence ${snap.company.licenceNumber}` : null, snap.company.phone, snap.company.email]
      .filter(Boolean)
      .join('  ·  '),
  );
  if (snap.inspector) body(`Inspector: ${snap.inspector.name}`);
  if (snap.company.footer) muted(snap.company.footer);

  // ---------- page numbers ----------
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Writing below the bottom margin would start a new page; lift the margin while the footer is drawn.
    const saved = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc
      .font('regular')
      .fontSize(8.5)
      .fillColor(palette.inkMuted)
      .text(`${snap.property.address} · ${grade.name}`, MARGIN, FOOTER_Y, { width: CONTENT_WIDTH - 90, lineBreak: false, ellipsis: true })
      .text(`Page ${i - range.start + 1} of ${range.count}`, MARGIN + CONTENT_WIDTH - 90, FOOTER_Y, {
        width: 90,
        align: 'right',
        lineBreak: false,
      });
    doc.page.margins.bottom = saved;
  }
  doc.end();
  await finished;
  return Buffer.concat(chunks);
}
