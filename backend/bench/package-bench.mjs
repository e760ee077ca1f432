// The making of a 40-page calculation package (layout with MathJax and charts, then the signature),
// against a reference measured in the same run: pdfkit writing the same number of pages of plain text.
// Goal: under 5 s for the package. Run with `npm run bench` (after the engine's figures).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
const { buildPackagePdf } = require('../dist/packages/package-pdf.js');
const { sampleSnapshot } = require('../dist/packages/sample-snapshot.js');
const { makeSelfSignedP12, signPdf } = require('../dist/packages/signing.js');
const PDFDocument = require('pdfkit');

const snapshotOf = (cells) => sampleSnapshot({ title: 'Bench sheet', cells });

const cells = [];
for (let k = 0; k < 27; k++) {
  cells.push({ kind: 'note', text: `## Branch ${k + 1}\nSteady-state current of branch ${k + 1}.` });
  cells.push({
    kind: 'calc',
    source: `R_${k} = ${k + 2} ohm\nL_${k} = ${10 + k} mH\nC_${k} = ${100 + k} uF\nw_${k} = 2 pi 50 Hz\nX_${k} = w_${k} L_${k} - 1 / (w_${k} C_${k})\nZ_${k} = sqrt(R_${k}^2 + X_${k}^2)\nI_${k} = 325 V / Z_${k} to A\nphi_${k} = atan(X_${k} / R_${k}) to deg\nZc_${k} = R_${k} + j X_${k}`,
  });
  cells.push({ kind: 'check', condition: `I_${k} <= 400 A`, basis: 'bench' });
  if (k % 3 === 0)
    cells.push({ kind: 'sweep', variable: 'f', from: '10 Hz', to: '10 kHz', points: 300, spacing: 'log', outputs: [`1 / (1 + j 2 pi f R_${k} C_${k})`] });
}
const snapshot = snapshotOf(cells);
const history = [
  {
    code: 'A',
    issuedAt: snapshot.dates.issuedAt,
    preparedBy: 'P',
    checkedBy: 'C',
    approvedBy: 'A',
    checkedAt: null,
    approvedAt: null,
    snapshotSha256: '0'.repeat(64),
  },
];

async function reference(pages) {
  const doc = new PDFDocument({ size: 'A4' });
  const chunks = [];
  doc.on('data', (c) => chunks.push(c));
  const done = new Promise((r) => doc.on('end', r));
  for (let p = 0; p < pages; p++) {
    if (p) doc.addPage();
    for (let l = 0; l < 40; l++) doc.text(`Reference line ${l} of page ${p + 1}: plain text with no formulas.`);
  }
  doc.end();
  await done;
  return Buffer.concat(chunks);
}

const pagesOf = (pdf) => {
  const file = join(mkdtempSync(join(tmpdir(), 'aw-bench-')), 'p.pdf');
  writeFileSync(file, pdf);
  return Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file]).toString())[1]);
};

const p12 = makeSelfSignedP12('Bench Firm', 'bench');
// One round by default: each package is made in a fresh worker thread, so a cold run is the honest figure.
const rounds = Number(process.env.BENCH_ROUNDS ?? 1);
let best = Infinity;
let bestRef = Infinity;
let pdf;
for (let r = 0; r < rounds; r++) {
  const t0 = performance.now();
  const unsigned = await buildPackagePdf({ revisionId: '00000000-0000-4000-8000-000000000000', snapshot, history, attachments: [] });
  pdf = await signPdf(unsigned, p12, 'bench', { firm: 'Bench Firm', reason: 'bench' });
  best = Math.min(best, performance.now() - t0);
  const pages = pagesOf(pdf);
  const t1 = performance.now();
  await reference(pages);
  bestRef = Math.min(bestRef, performance.now() - t1);
}
const pages = pagesOf(pdf);
process.stdout.write(
  `package: ${pages} pages, made and signed in ${(best / 1000).toFixed(2)} s (best of ${rounds}, cold); reference (pdfkit, ${pages} pages of plain text) ${(bestRef / 1000).toFixed(3)} s; ratio ${(best / bestRef).toFixed(1)}x; goal under 5 s: ${best < 5000 ? 'met' : 'NOT met'}\n`,
);
