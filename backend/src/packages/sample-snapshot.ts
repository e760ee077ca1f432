/**
 * A revision's snapshot of a sheet as the server makes it when it issues one (evaluated afresh), with
 * invented names and dates: for the package's tests and its benchmark, which lay out packages without a
 * database.
 */
import { ENGINE_VERSION, evaluateSheet, type SheetFile } from '@ampwright/common';
import type { RevisionSnapshot } from '../review/revisions.service';

export function sampleSnapshot(sheet: Pick<SheetFile, 'title' | 'cells'> & Partial<SheetFile>): RevisionSnapshot {
  const now = '2026-01-01T00:00:00.000Z';
  return {
    format: 'ampwright.revision/1',
    revision: { code: 'A', number: 1 },
    firm: 'Sample firm',
    project: { jobNumber: 'S-1', title: 'Sample project', clientOrganisation: 'Sample client', site: 'Sample site' },
    sheetNumber: 'C-1',
    sheet: { format: 'ampwright.sheet/1', ...sheet },
    cellIds: sheet.cells.map((_, i) => `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`),
    results: evaluateSheet(sheet).cells,
    engineVersion: ENGINE_VERSION,
    people: { preparedBy: 'P', checkedBy: 'C', approvedBy: 'A' },
    dates: { checkRequestedAt: now, checkedAt: now, approvedAt: now, issuedAt: now },
    queries: [],
    attachments: [],
  } as unknown as RevisionSnapshot;
}
