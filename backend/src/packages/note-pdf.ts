/**
 * A note in the package: the same document model the screen draws (common/notes/markdown.ts), laid out
 * line by line with pdfkit. Words are set in the embedded fonts; maths is drawn as vector paths by
 * MathJax, through the same path as the formulas, sitting on the text's baseline. A link is written as
 * its text and address and never becomes a link annotation.
 */
import SVGtoPDF from 'svg-to-pdfkit';
import { linkText, parseNote, type NoteBlock, type NoteInline } from '@ampwright/common';
import { drawTex, texToSvg, type TexSvg } from './tex-svg';

export interface NoteLayout {
  doc: PDFKit.PDFDocument;
  left: number;
  width: number;
  /** Starts a new page when fewer than h points are left. */
  ensure(h: number): void;
  colours: { text: string; muted: string; heading: string; rule: string };
}

type Font = 'sans' | 'bold' | 'italic' | 'mono';
type Piece = { kind: 'word'; text: string; font: Font; space: boolean } | { kind: 'maths'; t: TexSvg; space: boolean } | { kind: 'break' };

const fontOf = (r: Extract<NoteInline, { kind: 'text' }>): Font => (r.code ? 'mono' : r.strong ? 'bold' : r.emphasis ? 'italic' : 'sans');

/** A formula as MathJax vector paths, or undefined when its LaTeX cannot be typeset (it is then shown as source). */
function typeset(tex: string, size: number, style: 'display' | 'text'): TexSvg | undefined {
  try {
    return texToSvg(tex, size, style);
  } catch {
    return undefined;
  }
}

/** Inline runs as words (each knowing whether a space comes before it) and maths boxes. */
function pieces(inlines: NoteInline[], size: number, base: Font): Piece[] {
  const out: Piece[] = [];
  let pendingSpace = false;
  const words = (text: string, font: Font) => {
    for (const part of text.split(/(\s+)/)) {
      if (!part) continue;
      if (/^\s+$/.test(part)) pendingSpace = true;
      else {
        out.push({ kind: 'word', text: part, font, space: pendingSpace });
        pendingSpace = false;
      }
    }
  };
  for (const r of inlines) {
    if (r.kind === 'text') words(r.text, base === 'bold' ? 'bold' : fontOf(r));
    else if (r.kind === 'link') words(linkText(r), base);
    else if (r.kind === 'break') {
      out.push({ kind: 'break' });
      pendingSpace = false;
    } else {
      const t = typeset(r.tex, size, r.display ? 'display' : 'text');
      if (t) out.push({ kind: 'maths', t, space: pendingSpace });
      else words(`$${r.tex}$`, 'mono');
      pendingSpace = false;
    }
  }
  return out;
}

function drawMaths(doc: PDFKit.PDFDocument, t: TexSvg, x: number, y: number, w: number, colour: string) {
  if (!drawTex(doc, t, x, y, w, colour))
    SVGtoPDF(doc, t.svg.replace(/currentColor/g, colour), x, y, { width: w, height: (t.height * w) / t.width, assumePt: true });
}

/** Lays out one paragraph of runs from the current y, wrapping at the width; maths sits on the baseline. */
function flow(layout: NoteLayout, inlines: NoteInline[], opts: { size: number; font: Font; colour: string; indent?: number; marker?: string }) {
  const { doc } = layout;
  const left = layout.left + (opts.indent ?? 0);
  const width = layout.width - (opts.indent ?? 0);
  const all = pieces(inlines, opts.size, opts.font);
  const ascent = opts.size * 0.78;
  const descent = opts.size * 0.25;
  const widthOf = (p: Piece) =>
    p.kind === 'word' ? doc.font(p.font).fontSize(opts.size).widthOfString(p.text) : p.kind === 'maths' ? Math.min(p.t.width, width) : 0;
  const spaceOf = (p: Piece) =>
    p.kind !== 'break' && p.space
      ? doc
          .font(p.kind === 'word' ? p.font : opts.font)
          .fontSize(opts.size)
          .widthOfString(' ')
      : 0;
  let line: { p: Piece; x: number; w: number }[] = [];
  let x = 0;
  let first = true;
  const flush = () => {
    const up = Math.max(ascent, ...line.map(({ p }) => (p.kind === 'maths' ? p.t.height - p.t.depth : 0)));
    const down = Math.max(descent, ...line.map(({ p }) => (p.kind === 'maths' ? p.t.depth : 0)));
    const h = up + down + opts.size * 0.3;
    layout.ensure(h);
    const top = doc.y;
    const baseline = top + up;
    if (first && opts.marker)
      doc
        .font(opts.font)
        .fontSize(opts.size)
        .fillColor(opts.colour)
        .text(opts.marker, left - opts.size * 1.4, baseline - ascent, { lineBreak: false });
    for (const { p, x: px, w } of line) {
      if (p.kind === 'word')
        doc
          .font(p.font)
          .fontSize(opts.size)
          .fillColor(opts.colour)
          .text(p.text, left + px, baseline - ascent, { lineBreak: false });
      else if (p.kind === 'maths') drawMaths(doc, p.t, left + px, baseline - (p.t.height - p.t.depth) * (w / p.t.width), w, opts.colour);
    }
    doc.y = top + h;
    line = [];
    x = 0;
    first = false;
  };
  for (const p of all) {
    if (p.kind === 'break') {
      flush();
      continue;
    }
    const w = widthOf(p);
    const gap = line.length ? spaceOf(p) : 0;
    if (line.length && x + gap + w > width) flush();
    const lead = line.length ? gap : 0;
    line.push({ p, x: x + lead, w });
    x += lead + w;
  }
  if (line.length || first) flush();
  doc.x = layout.left;
}

/** Draws a note's Markdown into the package at the current position. */
export function drawNote(layout: NoteLayout, source: string): void {
  const { doc, colours } = layout;
  const blocks: NoteBlock[] = parseNote(source);
  for (const block of blocks) {
    switch (block.kind) {
      case 'heading':
        layout.ensure(40);
        flow(layout, block.inlines, { size: block.level === 1 ? 14 : block.level === 2 ? 12 : 11, font: 'bold', colour: colours.heading });
        break;
      case 'paragraph':
        flow(layout, block.inlines, { size: 10, font: 'sans', colour: block.quote ? colours.muted : colours.text, indent: block.quote ? 12 : 0 });
        break;
      case 'list':
        block.items.forEach((item, k) =>
          flow(layout, item, { size: 10, font: 'sans', colour: colours.text, indent: 16, marker: block.ordered ? `${block.start + k}.` : '•' }),
        );
        break;
      case 'maths': {
        const t = typeset(block.tex, 11, 'display');
        if (!t) {
          flow(layout, [{ kind: 'text', text: `$$${block.tex}$$`, code: true }], { size: 9, font: 'mono', colour: colours.text });
          break;
        }
        const w = Math.min(t.width, layout.width);
        const h = (t.height * w) / t.width;
        layout.ensure(h + 8);
        drawMaths(doc, t, layout.left + (layout.width - w) / 2, doc.y + 2, w, colours.text);
        doc.y += h + 8;
        break;
      }
      case 'code':
        layout.ensure(doc.font('mono').fontSize(8.5).heightOfString(block.text, { width: layout.width }) + 6);
        doc.font('mono').fontSize(8.5).fillColor(colours.text).text(block.text, layout.left, doc.y, { width: layout.width });
        break;
      case 'rule':
        layout.ensure(10);
        doc
          .moveTo(layout.left, doc.y + 4)
          .lineTo(layout.left + layout.width, doc.y + 4)
          .lineWidth(0.5)
          .strokeColor(colours.rule)
          .stroke();
        doc.y += 8;
        break;
    }
    doc.y += 4;
  }
}
