import { createHash } from 'node:crypto';
import { cellJson, type SheetFile } from '@ampwright/common';

/**
 * What a sheet's results depend on — its settings and its cells, in order — as one hash: the evaluation
 * process tags the evaluation it keeps with it, and a save names the fingerprint of the sheet whose results
 * are stored, so the process sends back only what differs from those. Equal sheets built the same way give
 * equal fingerprints; anything else only costs a complete answer, never a wrong one.
 */
export function sheetFingerprint(sheet: Pick<SheetFile, 'settings' | 'cells'>): string {
  // The hash of JSON.stringify([settings, cells]), written a cell at a time so that a sealed cell's JSON
  // (common's sealed-cells.ts) is not written again.
  const hash = createHash('sha256').update(`[${JSON.stringify(sheet.settings ?? null)},[`);
  sheet.cells.forEach((cell, k) => hash.update(k ? `,${cellJson(cell)}` : cellJson(cell)));
  return hash.update(']]').digest('base64');
}
