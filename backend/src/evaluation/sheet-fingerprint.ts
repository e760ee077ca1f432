import { createHash } from 'node:crypto';
import type { SheetFile } from '@ampwright/common';

/**
 * What a sheet's results depend on — its settings and its cells, in order — as one hash: the evaluation
 * process tags the evaluation it keeps with it, and a save names the fingerprint of the sheet whose results
 * are stored, so the process sends back only what differs from those. Equal sheets built the same way give
 * equal fingerprints; anything else only costs a complete answer, never a wrong one.
 */
export function sheetFingerprint(sheet: Pick<SheetFile, 'settings' | 'cells'>): string {
  return createHash('sha256')
    .update(JSON.stringify([sheet.settings ?? null, sheet.cells]))
    .digest('base64');
}
