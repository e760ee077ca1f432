import type { CellDto, SheetDto, SheetState, SheetSummaryDto, TemplateSummaryDto } from '@ampwright/common';

export type { SheetState };
export type SheetSummary = SheetSummaryDto;
export type CellView = CellDto;
export type SheetView = SheetDto;
export type TemplateSummary = TemplateSummaryDto;

export const STATE_LABELS: Record<SheetState, string> = {
  'being-prepared': 'Being prepared',
  'with-checker': 'With the checker',
  checked: 'Checked',
  approved: 'Approved',
  issued: 'Issued',
};

/** Every query key of this feature; a sheet's review and attachments live under its key. */
export const sheetKeys = {
  ofProject: (projectId: string) => ['projects', projectId, 'sheets'] as const,
  one: (id: string) => ['sheets', id] as const,
  templates: ['templates'] as const,
  attachments: (sheetId: string) => ['sheets', sheetId, 'attachments'] as const,
};
