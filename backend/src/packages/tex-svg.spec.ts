import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import { describe, expect, it } from 'vitest';
import { absolutePath, drawTex, texToSvg } from './tex-svg';

describe('absolutePath', () => {
  it('writes out the control point of smooth quadratic curves (SVG 1.1, 8.3.7: the reflection of the previous one)', () => {
    // Q from (0,0) with control (1,1) to (2,0); T to (4,0) reflects (1,1) about (2,0): (3,-1); the next T reflects (3,-1) about (4,0): (5,1).
    expect(absolutePath('M0 0Q1 1 2 0T4 0T6 0Z')).toBe('M0 0 Q1 1 2 0 Q3 -1 4 0 Q5 1 6 0 Z');
    // A T with no quadratic before it uses the current point as its control point (same clause).
    expect(absolutePath('M0 0L1 0T2 0')).toBe('M0 0 L1 0 Q1 0 2 0');
    // Relative and shorthand commands become absolute; pairs after M are lines (8.3.2).
    expect(absolutePath('m1 1 2 0h1v2l-1 0s1 1 2 2z')).toBe('M1 1 L3 1 L4 1 L4 3 L3 3 C3 3 4 4 5 5 Z');
    // Arcs are left to the SVG renderer.
    expect(absolutePath('M0 0A1 1 0 0 1 2 0')).toBe('');
  });
});

describe('drawTex', () => {
  const render = async (draw: (doc: PDFKit.PDFDocument) => void): Promise<Buffer> => {
    const dir = mkdtempSync(join(tmpdir(), 'aw-tex-'));
    const doc = new PDFDocument({ size: [300, 80], margin: 0 });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    const ended = new Promise((r) => doc.on('end', r));
    draw(doc);
    doc.end();
    await ended;
    writeFileSync(join(dir, 'f.pdf'), Buffer.concat(chunks));
    execFileSync('pdftoppm', ['-r', '300', '-gray', join(dir, 'f.pdf'), join(dir, 'f')]);
    return readFileSync(join(dir, 'f-1.pgm'));
  };

  it('draws formulas as the SVG renderer does (pixels compared, poppler pdftoppm)', async () => {
    for (const tex of [
      '\\phi = \\arctan\\left(\\frac{X}{R}\\right)',
      'Z = \\sqrt{{\\left(10.00\\,\\Omega\\right)}^{2}+{\\left(-25.55\\,\\Omega\\right)}^{2}}',
      'C = 100\\,\\mu\\mathrm{F} \\le 27.44\\,\\Omega\\angle -68.6^{\\circ}',
    ]) {
      const t = texToSvg(tex, 10.5);
      expect(t.ops, tex).toBeDefined();
      const ours = await render((doc) => expect(drawTex(doc, t, 10, 10, t.width, '#222222')).toBe(true));
      const theirs = await render((doc) =>
        SVGtoPDF(doc, t.svg.replace(/currentColor/g, '#222222'), 10, 10, { width: t.width, height: t.height, assumePt: true }),
      );
      expect(ours.length).toBe(theirs.length);
      let strong = 0;
      let ink = 0;
      for (let i = 0; i < ours.length; i++) {
        if (Math.abs(ours[i] - theirs[i]) > 64) strong++;
        if (theirs[i] < 128) ink++;
      }
      expect(ink, tex).toBeGreaterThan(200);
      // Edges differ by anti-aliasing (some 3 % of the ink at 300 dpi); pdfkit's own parser, which
      // mis-draws the smooth curves of the parentheses, differs by some 29 %.
      expect(strong / ink, tex).toBeLessThan(0.08);
    }
  });
});

describe('texToSvg with LaTeX an author wrote', () => {
  it('makes no link from \\href and runs no package that loads code or defines macros', () => {
    const linked = texToSvg('\\href{https://evil.example/login}{see datasheet}', 10);
    expect(linked.svg).not.toMatch(/<a[\s>]|evil\.example/);
    for (const tex of [
      '\\require{html}\\href{https://evil.example}{x}',
      '\\class{x}{y}',
      '\\style{color:red}{y}',
      '\\newcommand{\\a}{\\a\\a}\\a',
      '\\toggle{a}{b}\\endtoggle',
    ]) {
      expect(texToSvg(tex, 10).svg).not.toMatch(/<a[\s>]|evil\.example|class="x"|color:red/);
    }
  });
});
