import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSheetJson } from '@ampwright/common';
import { buildPackagePdf } from './package-pdf';
import { sampleSnapshot } from './sample-snapshot';

/** A revision's snapshot of a template. */
function snapshotOf(file: string) {
  const parsed = parseSheetJson(readFileSync(resolve(__dirname, '..', '..', '..', 'templates', file), 'utf8'));
  if (!parsed.ok) throw new Error(`${file} is not a sheet file`);
  return sampleSnapshot(parsed.sheet);
}

describe('the package of a network study', () => {
  it('states the per-phase equivalent and prints the element table, the results and the three charts', async () => {
    const pdf = await buildPackagePdf({ revisionId: 'r', snapshot: snapshotOf('switchboard-network-study.json'), history: [], attachments: [] });
    const dir = mkdtempSync(join(tmpdir(), 'aw-network-pdf-'));
    writeFileSync(join(dir, 'p.pdf'), pdf);
    const text = execFileSync('pdftotext', ['-layout', join(dir, 'p.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toMatch(/Per phase, positive sequence, single-phase equivalent/);
    expect(text).toMatch(/Step1 capacitor k1 gnd C = C_step/);
    expect(text).toMatch(/Resonances seen from node LV/);
    expect(text).toMatch(/parallel 170\.9 Hz 3\.418/);
    expect(text).toMatch(/Voltage distortion at each node/);
    expect(text).toMatch(/Extremes over 40\.00 ms/);
    // The charts: the scan's impedance against frequency, the bars against the IEEE 519 limit, the time response.
    expect(text).toContain('|Z(LV)| [Ω]');
    expect(text).toContain('limit 5 %');
    expect(text).toContain('t [s]');
    expect(text).toMatch(/qualified engineers/);
  });
});
