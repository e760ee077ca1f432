/** Sheets and cells as the API answers them, for the unit specs. */
import type { CellDto, SheetDto } from '@ampwright/common';

export const calcCell = (id: string, position: number, source: string, changedBy = 'A'): CellDto => ({
  id,
  position,
  kind: 'calc',
  fields: { source },
  results: null,
  changedBy,
  changedAt: '2026-01-01T00:00:00.000Z',
  agreedBy: null,
  changedAfterAgreement: false,
});

export const sheetOf = (version: number, cells: CellDto[], overrides: Partial<SheetDto> = {}): SheetDto => ({
  id: 's1',
  projectId: 'p1',
  number: 'C-1',
  title: 'T',
  settings: {},
  state: 'being-prepared',
  version,
  engineVersion: null,
  preparer: { id: 'u', name: 'A' },
  checker: null,
  approver: null,
  revisionCode: 'A',
  revisionNumber: 1,
  openQueries: 0,
  coPreparers: [],
  authorIds: ['u'],
  cells,
  ...overrides,
});
