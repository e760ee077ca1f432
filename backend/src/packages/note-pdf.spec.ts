import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import { drawNote } from './note-pdf';

const WIDTH = 400;

/** A one-page PDF with the note drawn in the embedded-font-free standard fonts, its text and its picture. */
async function renderNote(source: string): Promise<{ raw: string; text: string; rows: number[] }> {
  const dir = mkdtempSync(join(tmpdir(), 'aw-note-'));
  const doc = new PDFDocument({ size: [WIDTH + 40, 300], margin: 20 });
  doc.registerFont('sans', 'Helvetica');
  doc.registerFont('bold', 'Helvetica-Bold');
  doc.registerFont('italic', 'Helvetica-Oblique');
  doc.registerFont('mono', 'Courier');
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const ended = new Promise((r) => doc.on('end', r));
  doc.y = 20;
  drawNote(
    { doc, left: 20, width: WIDTH, ensure: () => undefined, colours: { text: '#000000', muted: '#444444', heading: '#000000', rule: '#888888' } },
    source,
  );
  doc.end();
  await ended;
  const pdf = Buffer.concat(chunks);
  writeFileSync(join(dir, 'n.pdf'), pdf);
  const text = execFileSync('pdftotext', [join(dir, 'n.pdf'), '-']).toString();
  execFileSync('pdftoppm', ['-r', '144', '-gray', join(dir, 'n.pdf'), join(dir, 'n')]);
  // The picture as rows of ink counts (P5 PGM: header, then one byte a pixel).
  const pgm = readFileSync(join(dir, 'n-1.pgm'));
  const header = /^P5\s+(\d+)\s+(\d+)\s+255\s/.exec(pgm.subarray(0, 40).toString('latin1'))!;
  const [w, h] = [Number(header[1]), Number(header[2])];
  const pixels = pgm.subarray(header[0].length);
  const rows = Array.from({ length: h }, (_, y) => {
    let ink = 0;
    for (let x = 0; x < w; x++) if (pixels[y * w + x] < 128) ink++;
    return ink;
  });
  return { raw: pdf.toString('latin1'), text, rows };
}

/** Height in pixels of the band of rows with ink. */
const inkHeight = (rows: number[]) => {
  const inked = rows.map((n, y) => (n > 0 ? y : -1)).filter((y) => y >= 0);
  return inked.length ? inked[inked.length - 1] - inked[0] + 1 : 0;
};
const totalInk = (rows: number[]) => rows.reduce((a, b) => a + b, 0);

describe('notes in the package', () => {
  it('draws inline maths as maths: no TeX source in the text, and a fraction stands taller than the words (pdftotext, pdftoppm)', async () => {
    const note = await renderNote('Ohm: $I = \\frac{V}{R}$ and $X_L$ done.');
    expect(note.text).toContain('Ohm:');
    expect(note.text).toContain('done.');
    expect(note.text).not.toMatch(/frac|fracVR|\$|X_L|XL/);
    const plain = await renderNote('Ohm: I = V/R and XL done.');
    // A built-up fraction (text style) is over 1.3 times the height of a line of words.
    expect(inkHeight(note.rows)).toBeGreaterThan(1.3 * inkHeight(plain.rows));
    expect(totalInk(note.rows)).toBeGreaterThan(0.5 * totalInk(plain.rows));
  });

  it('draws display maths on its own lines, and headings, lists and emphasis as text', async () => {
    const note = await renderNote('## Sizing\nThe **bank** is *star* connected.\n\n$$\nQ = 3 \\omega C V_{ph}^2\n$$\n\n1. first\n2. second');
    expect(note.text).toMatch(/Sizing/);
    expect(note.text).toMatch(/The bank is star connected\./);
    expect(note.text).toMatch(/1\.\s+first/);
    expect(note.text).toMatch(/2\.\s+second/);
    expect(note.text).not.toMatch(/omega|V_\{ph\}|\$\$/);
    // Three bands of ink at least: heading, sentence, maths, the list (gaps between them).
    const bands = note.rows.reduce((acc, n, y) => acc + (n > 0 && (y === 0 || note.rows[y - 1] === 0) ? 1 : 0), 0);
    expect(bands).toBeGreaterThanOrEqual(5);
  });

  it('writes a link as its text and address, with no link annotation in the file', async () => {
    const note = await renderNote('See the [maker’s datasheet](https://example.com/ds.pdf) and <a href="https://evil.example">this</a>.');
    expect(note.text.replace(/\s+/g, ' ')).toContain('maker’s datasheet (https://example.com/ds.pdf)');
    // Raw HTML is not read as HTML: it stays text, so nothing can be made live.
    expect(note.raw).not.toMatch(/\/URI|\/Subtype\s*\/Link/);
  });

  it('keeps LaTeX it cannot typeset as source text rather than failing the package', async () => {
    const note = await renderNote('Bad: $\\frac{1}{$ and fine.');
    expect(note.text).toContain('fine.');
  });
});
