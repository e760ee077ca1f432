/**
 * The messages between the server and its evaluation processes. Everything a user can send that takes
 * unbounded time or memory to work through — a sheet, a CSV upload, a PKCS#12 file — is handled there,
 * where running out of memory or time ends one process and never the server.
 */
import type { Cell, CellResult, CsvTableResult, SheetFile } from '@ampwright/common';
import type { CertificateFacts } from '../packages/signing';

/** What evaluating a sheet gave, as the process knows it. */
export interface SheetEvaluated {
  /**
   * Every cell's results in order (`complete`), or — when the process held the evaluation of the sheet
   * `base` names — only those of the cells evaluated afresh and of the cells asked for (`want`): the
   * others are as `base` had them. Results are most of a message's size, so a save takes back only these.
   */
  results: [index: number, result: CellResult][];
  complete: boolean;
  engineVersion: string;
  /** Indexes of the cells evaluated afresh; the others' results came from the kept cache. */
  evaluated: number[];
  /** The engine's own time on the sheet, in ms (without the messages to and from the process). */
  engineMs: number;
  /** The fingerprint (sheetFingerprint) of the sheet evaluated, which the process keeps its evaluation under (with a `key`). */
  fingerprint?: string;
}

export interface TaskResults {
  /** Evaluates a sheet; `key` (a stored sheet's id) lets the process reuse what it kept of that sheet. */
  evaluate: SheetEvaluated;
  /**
   * Evaluates a kept sheet with one cell replaced; `held: false` (nothing evaluated) when the process does not
   * keep the evaluation of the sheet `base` names — the caller then sends the whole sheet.
   */
  edit: SheetEvaluated | { held: false };
  /** Parses an uploaded CSV as a table cell; `binary` when the bytes are not UTF-8 text. */
  csv: CsvTableResult | { ok: false; binary: true };
  /** Opens an uploaded PKCS#12 file and describes its certificate. */
  certificate: { ok: true; facts: CertificateFacts } | { ok: false; problem: string };
}

export type SandboxTask =
  /**
   * `key`: a stored sheet's id, under which the process keeps the evaluation for the next one. `base`: the
   * fingerprint (sheetFingerprint) of the sheet whose results the caller holds; when the kept evaluation is
   * of that sheet, only what differs from it comes back, with the results of the cells `want` lists.
   */
  | { kind: 'evaluate'; sheet: SheetFile; key?: string; base?: string; want?: number[] }
  /**
   * The usual save, sent small: the sheet `key` as the process kept it (its fingerprint `base`) with the cell
   * at `index` replaced by `cell`. What differs from `base` comes back, with the edited cell's results.
   */
  | { kind: 'edit'; key: string; base: string; index: number; cell: Cell }
  | { kind: 'csv'; bytes: Uint8Array }
  | { kind: 'certificate'; p12: Uint8Array; password: string };

export type TaskKind = SandboxTask['kind'];
export type TaskOf<K extends TaskKind> = Extract<SandboxTask, { kind: K }>;

export interface SandboxRequest {
  id: number;
  task: SandboxTask;
  /** The soft deadline of an evaluation, in ms from now: past it the sheet stops by itself and the process lives on. */
  timeoutMs: number;
}

export type SandboxReply =
  | { ready: true }
  | { id: number; ok: true; value: TaskResults[TaskKind] }
  /** `timeout`: the evaluation stopped itself at its soft deadline; `cell`: the index of the cell it was evaluating. */
  | { id: number; ok: false; message: string; timeout?: true; cell?: number };
