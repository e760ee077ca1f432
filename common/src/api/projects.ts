/** Bodies of the projects and sheets API, shared by the server that builds them and the app that reads them. */
import type { FieldsOf } from '../cells/kinds';
import type { CellResult } from '../cells/types';
import type { CsvDetected } from '../sheet/csv-table';
import type { CellKind } from '../sheet/sheet-format';

export type SheetState = 'being-prepared' | 'with-checker' | 'checked' | 'approved' | 'issued';

export interface ProjectDto {
  id: string;
  jobNumber: string;
  title: string;
  clientOrganisation: string;
  site: string;
  /** Members only: a client is told nothing of the firm's internal work. */
  sheetCount?: number;
  /** Queries not yet closed, over the project's sheets (members only). */
  openQueries?: number;
  createdAt: string;
  updatedAt: string;
}

export interface SheetSummaryDto {
  id: string;
  number: string;
  title: string;
  state: SheetState;
  version: number;
  preparer: string;
  openQueries: number;
  updatedAt: string;
}

interface CellDtoBase<K extends CellKind> {
  id: string;
  position: number;
  kind: K;
  /** The cell as in the sheet file, without `kind` (typed by its kind; fields this version does not know are kept). */
  fields: FieldsOf<K>;
  /** What the server computed when the sheet was last saved. */
  results: CellResult | null;
  changedBy: string | null;
  changedAt: string;
  /** The checker's agreement with this cell, withdrawn when the cell is edited. */
  agreedBy: string | null;
  /** Edited after the checker agreed it: shown to the checker. */
  changedAfterAgreement: boolean;
}

/** A cell of a sheet: a union over the kinds, so `kind` narrows `fields`. */
export type CellDto = { [K in CellKind]: CellDtoBase<K> }[CellKind];

export interface SheetDto {
  id: string;
  projectId: string;
  number: string;
  title: string;
  settings: Record<string, unknown>;
  state: SheetState;
  version: number;
  engineVersion: string | null;
  preparer: { id: string; name: string };
  checker: { id: string; name: string } | null;
  approver: { id: string; name: string } | null;
  /** The revision this sheet is being prepared as (its next issue), e.g. "A"; the last issued one once issued. */
  revisionCode: string;
  revisionNumber: number;
  openQueries: number;
  /** Co-preparers the preparer named for this revision: they may edit it. */
  coPreparers: { id: string; name: string }[];
  /**
   * Everyone who prepared this revision — the preparer, the co-preparers, anyone whose save was stored:
   * none of them may check or approve it.
   */
  authorIds: string[];
  cells: CellDto[];
}

/** PUT /api/sheets/:id/co-preparers: the named co-preparers of the revision being prepared (replaces the list). */
export interface CoPreparersBody {
  userIds: string[];
}

/**
 * The answer to a saved change: the sheet's new version, every cell the change touched (its content, place
 * or people), whole with its results; the results of the other cells evaluated afresh (their content is
 * as the editor has it); and the ids of cells removed.
 */
export interface SaveResultDto {
  version: number;
  changed: CellDto[];
  reevaluated: CellResultsDto[];
  removed: string[];
}

/** A cell's new results, by its id. */
export interface CellResultsDto {
  id: string;
  results: CellResult;
}

/** The answer to a CSV import: the save, and what was detected in the file (delimiter, decimal mark, size). */
export interface ImportResultDto extends SaveResultDto {
  detected: CsvDetected;
}

/**
 * What a save refused as stale (409, code STALE_VERSION) carries in `current`: what the editor
 * needs to merge — the version and state now, and every cell's content in order. Results are not
 * included (`results: null`): the editor keeps those of the cells whose content it already has, and
 * reads the sheet again once its own change is saved.
 */
export interface SheetContentsDto {
  version: number;
  state: SheetState;
  cells: CellDto[];
}

export interface TemplateSummaryDto {
  /** A built-in template's file name, or a firm template's uuid. */
  id: string;
  title: string;
  cellCount: number;
  source: 'built-in' | 'firm';
}

export interface AttachmentDto {
  id: string;
  fileName: string;
  /** Judged by the server from the content. */
  mediaType: string;
  size: number;
  /** Hex SHA-256 of the bytes. */
  sha256: string;
  uploadedBy: string | null;
  createdAt: string;
}

export interface ProjectPeopleDto {
  members: { id: string; name: string; email: string; roles: string[] }[];
  clients: { id: string; name: string; email: string }[];
}
