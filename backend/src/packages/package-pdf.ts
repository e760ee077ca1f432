/**
 * The calculation package as a PDF (pdfkit, with the IBM Plex fonts embedded): cover sheet, revision
 * history, contents, every cell in order (formulas, working and results as vector MathJax drawings,
 * checks, charts from common/plot, tables), the attachments listed and embedded, and the query
 * register; a header and a footer on every page. The same snapshot always gives the same bytes:
 * every date in the file is the issue date, and nothing random is written.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import {
  CAUTION_SHORT,
  CAUTION_TEXT,
  PALETTE,
  cellInputs,
  kindFacts,
  kindLabel,
  presentCell,
  type BlockOf,
  type BlockType,
  type CellResult,
  type LineResult,
  type PresentationBlock,
  type QueryDto,
  type RevisionSummaryDto,
  type Tone,
} from '@ampwright/common';
import type { RevisionSnapshot } from '../review/revisions.service';
import { drawNote } from './note-pdf';
import { drawTex, texToSvg } from './tex-svg';
import { woffToSfnt } from './woff';

export interface PackageAttachment {
  fileName: string;
  mediaType: string;
  size: number;
  sha256: string;
  body: Buffer;
}

export interface PackageInput {
  revisionId: string;
  snapshot: RevisionSnapshot;
  /** Every issued revision of the sheet up to this one. */
  history: RevisionSummaryDto[];
  attachments: PackageAttachment[];
  /** Called with a fraction as the pages are laid out. */
  onProgress?: (fraction: number) => void;
}

const { ink: INK, copper: COPPER, text: TEXT, muted: MUTED, rule: RULE, pass: PASS, fail: FAIL, caution: CAUTION } = PALETTE;
/** The colour of each tone of common/cells/presentation.ts. */
const TONE: Record<Tone, string> = { pass: PASS, caution: CAUTION, fail: FAIL, none: MUTED };

const fontDir = (pkg: string) => join(dirname(require.resolve(`${pkg}/package.json`)), 'fonts', 'complete', 'woff');
const FONT_FILES = {
  sans: join(fontDir('@ibm/plex-sans'), 'IBMPlexSans-Regular.woff'),
  bold: join(fontDir('@ibm/plex-sans'), 'IBMPlexSans-SemiBold.woff'),
  italic: join(fontDir('@ibm/plex-sans'), 'IBMPlexSans-Italic.woff'),
  mono: join(fontDir('@ibm/plex-mono'), 'IBMPlexMono-Regular.woff'),
};
/** The fonts unpacked once per process (see woff.ts). */
let fonts: Record<keyof typeof FONT_FILES, Buffer> | undefined;
const FONTS = () =>
  (fonts ??= Object.fromEntries(Object.entries(FONT_FILES).map(([k, f]) => [k, woffToSfnt(readFileSync(f))])) as Record<keyof typeof FONT_FILES, Buffer>);

/** The metadata key that carries the revision id (read back by the verification page). */
export const REVISION_KEY = 'AmpwrightRevision';

const M = 56; // margin
const date = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : '—');

export function buildPackagePdf(input: PackageInput): Promise<Buffer> {
  const { snapshot: snap } = input;
  const issued = new Date(snap.dates.issuedAt);
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: M + 10, bottom: M, left: M, right: M },
    bufferPages: true,
    autoFirstPage: false,
    info: {
      Title: `${snap.project.jobNumber} ${snap.sheetNumber} revision ${snap.revision.code}: ${snap.sheet.title}`,
      Author: snap.firm,
      Subject: `Calculation package, ${snap.project.title}`,
      Keywords: `${REVISION_KEY}:${input.revisionId}`,
      Creator: 'Ampwright',
      Producer: 'Ampwright (pdfkit)',
      CreationDate: issued,
      ModDate: issued,
      [REVISION_KEY]: input.revisionId,
    } as PDFKit.DocumentInfo,
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  for (const [name, font] of Object.entries(FONTS())) doc.registerFont(name, font);

  const width = () => doc.page.width - 2 * M;
  const bottom = () => doc.page.height - M - 8;
  const ensure = (h: number) => {
    if (doc.y + h > bottom()) doc.addPage();
  };
  const heading = (text: string, size = 15) => {
    ensure(size * 3);
    doc.moveDown(0.6).font('bold').fontSize(size).fillColor(INK).text(text, M, doc.y);
    doc.moveDown(0.3).fillColor(TEXT).font('sans').fontSize(10);
  };
  const para = (text: string, opts: { font?: string; size?: number; colour?: string } = {}) => {
    doc
      .font(opts.font ?? 'sans')
      .fontSize(opts.size ?? 10)
      .fillColor(opts.colour ?? TEXT);
    ensure(doc.heightOfString(text, { width: width() }) + 4);
    doc.text(text, M, doc.y, { width: width() });
  };
  /** A TeX drawing at (x, y), scaled down to fit maxWidth; returns its height. */
  const tex = (source: string, x: number, y: number, maxWidth: number, size = 10.5): { w: number; h: number } => {
    try {
      const t = texToSvg(source, size);
      const k = t.width > maxWidth ? maxWidth / t.width : 1;
      if (!drawTex(doc, t, x, y, t.width * k, TEXT))
        SVGtoPDF(doc, t.svg.replace(/currentColor/g, TEXT), x, y, { width: t.width * k, height: t.height * k, assumePt: true });
      return { w: t.width * k, h: t.height * k };
    } catch {
      doc.font('mono').fontSize(8).fillColor(TEXT).text(source, x, y, { width: maxWidth });
      return { w: maxWidth, h: doc.heightOfString(source, { width: maxWidth }) };
    }
  };
  const svgFigure = (svg: string, maxWidth: number) => {
    const m = /viewBox="0 0 ([\d.]+) ([\d.]+)"/.exec(svg);
    if (!m) return;
    const w0 = Number(m[1]);
    const h0 = Number(m[2]);
    const w = Math.min(maxWidth, w0 * 0.75);
    const h = (h0 * w) / w0;
    ensure(h + 8);
    // The drawing's own size attributes are set to the size on the page (svg-to-pdfkit follows them).
    const sized = svg.replace(/^<svg([^>]*?) width="[^"]*" height="[^"]*"/, `<svg$1 width="${w.toFixed(2)}" height="${h.toFixed(2)}"`);
    SVGtoPDF(doc, sized.replace(/∠/g, 'at'), M, doc.y, { width: w, height: h, assumePt: true, fontCallback: () => 'sans' });
    doc.y += h + 8;
  };

  // Cover sheet.
  doc.addPage();
  doc
    .font('bold')
    .fontSize(11)
    .fillColor(COPPER)
    .text(snap.firm.toUpperCase(), M, M + 20, { characterSpacing: 1 });
  doc.moveDown(2).font('bold').fontSize(24).fillColor(INK).text('Calculation package');
  doc.moveDown(0.4).font('sans').fontSize(16).fillColor(TEXT).text(snap.sheet.title, { width: width() });
  doc.moveDown(1.2);
  const facts: [string, string][] = [
    ['Project', snap.project.title],
    ['Job number', snap.project.jobNumber],
    ['Client', snap.project.clientOrganisation],
    ['Site', snap.project.site],
    ['Sheet', snap.sheetNumber],
    ['Revision', snap.revision.code],
    ['Prepared by', `${snap.people.preparedBy}, check asked ${date(snap.dates.checkRequestedAt)}`],
    ['Checked by', `${snap.people.checkedBy}, ${date(snap.dates.checkedAt)}`],
    ['Approved by', `${snap.people.approvedBy}, ${date(snap.dates.approvedAt)}`],
    ['Issued', date(snap.dates.issuedAt)],
    ['Engine', `Ampwright engine ${snap.engineVersion}`],
  ];
  for (const [k, v] of facts) {
    const y = doc.y;
    doc.font('bold').fontSize(10).fillColor(MUTED).text(k, M, y, { width: 110 });
    doc
      .font('sans')
      .fillColor(TEXT)
      .text(v, M + 120, y, { width: width() - 120 });
    doc.moveDown(0.35);
  }
  doc.moveDown(1.5);
  const cy = doc.y;
  const ch =
    doc
      .font('sans')
      .fontSize(10)
      .heightOfString(CAUTION_TEXT, { width: width() - 24 }) + 30;
  doc.rect(M, cy, width(), ch).lineWidth(1).strokeColor(CAUTION).stroke();
  doc
    .font('bold')
    .fontSize(10)
    .fillColor(CAUTION)
    .text('Caution', M + 12, cy + 8);
  doc
    .font('sans')
    .fillColor(TEXT)
    .text(CAUTION_TEXT, M + 12, cy + 22, { width: width() - 24 });

  // Revision history and contents.
  doc.addPage();
  heading('Revision history');
  for (const r of input.history) {
    para(
      `${r.code} — issued ${date(r.issuedAt)}; prepared by ${r.preparedBy}, checked by ${r.checkedBy} (${date(r.checkedAt)}), approved by ${r.approvedBy} (${date(r.approvedAt)}); snapshot SHA-256 ${r.snapshotSha256}`,
      { size: 9 },
    );
    doc.moveDown(0.3);
  }
  heading('Contents');
  const contentsPage = doc.bufferedPageRange().count - 1;
  const contentsY = doc.y;
  const cells = snap.sheet.cells;
  const entries: { label: string; page: number }[] = [];
  doc.y += (cells.length + 3) * 13;
  if (doc.y > bottom()) doc.addPage();

  /** How each block of a cell's presentation (common/cells/presentation.ts) is drawn on paper; the screen draws the same blocks. */
  const DRAW: { [T in BlockType]: (block: BlockOf<T>) => void } = {
    note: (b) => drawNote({ doc, left: M, width: width(), ensure, colours: { text: TEXT, muted: MUTED, heading: INK, rule: RULE } }, b.text),
    lines: (b) => drawLines(b.lines),
    outcome: (b) => drawOutcome(b),
    rows: (b) => b.rows.forEach((row) => para(`${row.label}: ${row.text}`, { size: 9 })),
    figure: (b) => svgFigure(b.svg, b.small ? width() * 0.6 : width()),
    sentence: (b) => para(b.text, b.style === 'caption' ? { font: 'italic' } : b.style === 'muted' ? { size: 9, colour: MUTED } : { size: 9 }),
    table: (b) => drawTable(b),
  };
  const draw = (block: PresentationBlock) => (DRAW[block.type] as (b: PresentationBlock) => void)(block);

  // The cells.
  doc.addPage();
  cells.forEach((fileCell, i) => {
    const { kind, ...fields } = fileCell as Record<string, unknown> & { kind: string };
    const result = (snap.results[i] ?? null) as CellResult | null;
    ensure(40);
    entries.push({
      label: `Cell ${i + 1}: ${kindLabel(kind).toLowerCase()}${
        kind === 'note'
          ? ` — ${String(fields.text ?? '')
              .split('\n')[0]
              .replace(/^#+\s*/, '')
              .slice(0, 60)}`
          : ''
      }`,
      page: doc.bufferedPageRange().count,
    });
    doc.moveDown(0.5);
    doc
      .font('bold')
      .fontSize(8)
      .fillColor(MUTED)
      .text(`${i + 1} · ${kindLabel(kind).toUpperCase()}`, M, doc.y, { characterSpacing: 0.8 });
    doc
      .moveTo(M, doc.y + 1)
      .lineTo(M + width(), doc.y + 1)
      .lineWidth(0.5)
      .strokeColor(RULE)
      .stroke();
    doc.moveDown(0.4);
    if (kindFacts(kind).inputsInPackage && result) para(cellInputs(kind, fields).replace(/\n/g, '; '), { size: 9, colour: MUTED });
    presentCell(kind, fields, result).forEach(draw);
    if (result && result.errors.length)
      for (const e of result.errors) para(`Error, line ${e.line}, column ${e.column}: ${e.message}`, { colour: FAIL, size: 9 });
    input.onProgress?.(((i + 1) / cells.length) * 0.9);
  });

  function drawLines(lines: LineResult[]) {
    for (const line of lines) {
      if (!line.tex) continue;
      const f = texToSvgSize(line.tex.formula, 10.5);
      ensure(Math.max(f, 14) + 30);
      const y = doc.y;
      const left = tex(line.tex.formula, M, y, width() * 0.55);
      const right = tex(line.tex.result, M + width() * 0.62, y, width() * 0.38);
      let y2 = y + Math.max(left.h, right.h) + 3;
      const working = tex(line.tex.working, M + 14, y2, width() - 14, 9);
      y2 += working.h + 2;
      doc.y = y2;
      if (line.description) {
        doc
          .font('italic')
          .fontSize(8)
          .fillColor(MUTED)
          .text(line.description, M + 14, doc.y, { width: width() - 14 });
      }
      if (line.convention) {
        doc
          .font('sans')
          .fontSize(8)
          .fillColor(MUTED)
          .text(line.convention, M + 14, doc.y, { width: width() - 14 });
      }
      doc.moveDown(0.35);
    }
  }

  function texToSvgSize(source: string, size: number): number {
    try {
      return texToSvg(source, size).height;
    } catch {
      return 12;
    }
  }

  function drawOutcome({ check: p, formula, working }: BlockOf<'outcome'>) {
    ensure(70);
    const y = doc.y;
    doc.rect(M, y, 64, 16).fillColor(TONE[p.tone]).fill();
    doc
      .font('bold')
      .fontSize(9)
      .fillColor('#ffffff')
      .text(p.outcome.toUpperCase(), M, y + 4, { width: 64, align: 'center' });
    if (formula) tex(formula, M + 76, y + 1, width() - 76);
    doc.y = y + 22;
    if (working) {
      const w = tex(working, M + 14, doc.y, width() - 14, 9);
      doc.y += w.h + 4;
    }
    if (p.utilisation) {
      const barW = 220;
      doc
        .rect(M + 14, doc.y, barW, 6)
        .fillColor(RULE)
        .fill();
      doc
        .rect(M + 14, doc.y, p.utilisation.fraction * barW, 6)
        .fillColor(TONE[p.utilisation.band])
        .fill();
      doc
        .font('sans')
        .fontSize(9)
        .fillColor(TEXT)
        .text(`${p.utilisation.text}${p.advisory ? ' (advisory)' : ''}`, M + 24 + barW, doc.y - 2);
      doc.moveDown(0.2);
    }
  }

  function drawTable({ columns, rows }: BlockOf<'table'>) {
    const colW = Math.min(110, width() / Math.max(1, columns.length));
    const row = (values: string[], font: string) => {
      ensure(14);
      const y = doc.y;
      values.forEach((v, j) =>
        doc
          .font(font)
          .fontSize(9)
          .fillColor(TEXT)
          .text(v, M + j * colW, y, { width: colW - 6, lineBreak: false, ellipsis: true }),
      );
      doc.y = y + 13;
    };
    row(
      columns.map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name)),
      'bold',
    );
    for (const r of rows) row(r, 'mono');
    doc.moveDown(0.3);
  }

  // Attachments.
  doc.addPage();
  heading('Attachments');
  if (!input.attachments.length) para('None.');
  for (const a of input.attachments) {
    para(`${a.fileName} — ${a.mediaType}, ${a.size} bytes`, { font: 'bold', size: 9 });
    para(`SHA-256 ${a.sha256}`, { font: 'mono', size: 8, colour: MUTED });
    doc.file(a.body, { name: a.fileName, type: a.mediaType, description: `SHA-256 ${a.sha256}`, creationDate: issued, modifiedDate: issued });
    doc.moveDown(0.3);
  }
  if (input.attachments.length) para('The attachments are embedded in this file (open the attachments panel of your PDF reader).', { size: 9, colour: MUTED });

  // Query register: the firm's internal review, included only where the firm chose so (older snapshots: always).
  if (snap.packageOptions?.queryRegister !== false) {
    heading('Appendix: query register');
    if (!snap.queries.length) para('No queries were raised for this revision.');
    snap.queries.forEach((q: QueryDto, k) => {
      const where = q.cellId ? `cell ${snap.cellIds.indexOf(q.cellId) + 1}${q.line ? `, line ${q.line}` : ''}` : 'a cell since removed';
      para(`Query ${k + 1} on ${where} — ${q.status}${q.closedBy ? `, closed by ${q.closedBy} ${date(q.closedAt)}` : ''}`, { font: 'bold', size: 9 });
      for (const m of q.messages) para(`${m.author} (${date(m.createdAt)}): ${m.text}`, { size: 9 });
      doc.moveDown(0.3);
    });
  }

  // Contents, headers and footers, now that the pages are known.
  const range = doc.bufferedPageRange();
  doc.switchToPage(contentsPage);
  let y = contentsY;
  for (const e of entries) {
    doc
      .font('sans')
      .fontSize(9)
      .fillColor(TEXT)
      .text(e.label, M, y, { width: width() - 50, lineBreak: false, ellipsis: true });
    doc.text(String(e.page), M + width() - 40, y, { width: 40, align: 'right', lineBreak: false });
    y += 13;
    if (y > bottom()) break;
  }
  for (let p = 0; p < range.count; p++) {
    doc.switchToPage(range.start + p);
    const keep = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    doc.font('sans').fontSize(8).fillColor(MUTED);
    doc.text(`${snap.firm} · Job ${snap.project.jobNumber} · Sheet ${snap.sheetNumber} · Revision ${snap.revision.code}`, M, M - 24, {
      width: width(),
      lineBreak: false,
    });
    doc
      .moveTo(M, M - 12)
      .lineTo(M + width(), M - 12)
      .lineWidth(0.5)
      .strokeColor(RULE)
      .stroke();
    doc.text(CAUTION_SHORT, M, doc.page.height - M + 14, { width: width() - 80, lineBreak: false });
    doc.text(`Page ${p + 1} of ${range.count}`, M + width() - 80, doc.page.height - M + 14, { width: 80, align: 'right', lineBreak: false });
    doc.page.margins.bottom = keep;
  }
  input.onProgress?.(1);
  doc.end();
  return done;
}
