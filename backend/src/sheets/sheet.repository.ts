/**
 * The SQL of sheets and their cells: reading a sheet as the API shows it, the steps of a save (raise the
 * version, read the cells, store the results) and the open-query counts of a list. Methods run in the
 * caller's transaction when there is one (MikroORM's transaction context).
 */
import { EntityRepository } from '@mikro-orm/mariadb';
import { revisionCode, type CellDto, type CellResult, type SheetContentsDto, type SheetDto, type SheetState } from '@ampwright/common';
import { Sheet } from './entities/sheet.entity';
import type { SheetViewCache } from './sheet-view-cache';

/** A cell row as read for a sheet's view, without loading entities (reads are the hot path). */
interface CellRow {
  id: string;
  position: number;
  kind: string;
  fields: unknown;
  changed_at: Date | string;
  changed_after_agreement: number | boolean;
  changed_by: string | null;
  agreed_by: string | null;
}

interface SheetRow extends PeopleRow {
  id: string;
  project_id: string;
  number: string;
  title: string;
  settings: unknown;
  state: SheetState;
  version: number;
  engine_version: string | null;
  revision_number: number;
  open_queries: number | bigint | string;
  /** One author of the revision besides its preparer per row (AUTHOR_JOIN), or nulls in the one row when there is none. */
  author_id: string | null;
  author_name: string | null;
  author_named: number | boolean | null;
}

/** A sheet as a save needs it: what the rulebook looks at, and its heading and unknown top-level fields. */
export interface SheetHeadingRow {
  id: string;
  state: SheetState;
  version: number;
  revisionNumber: number;
  title: string;
  settings: Record<string, unknown>;
  extra: Record<string, unknown>;
  preparer: { id: string; name: string };
  checker: { id: string; name: string } | null;
  approver: { id: string; name: string } | null;
  /** The version whose evaluation the stored results are (null: not known, or the evaluation failed). */
  resultsVersion: number | null;
  /** The engine that evaluated the stored results. */
  engineVersion: string | null;
  /** The fingerprint of the content the stored results are the evaluation of (null: not known). */
  resultsFingerprint: string | null;
  /** With `heading(…, { cells: true })`: the cells of the version read, in order; with `{ cell }`, that one cell (or none). */
  cells?: CellRecord[];
  /** With `heading(…, { cell })`: the ids of every cell of the version read, in order (absent if too many to list in one statement). */
  cellIds?: string[];
}

/** The results of an evaluation of a whole sheet, stored only while the sheet is still at the version evaluated. */
export interface ResultsToStore {
  /** The version that was evaluated. */
  version: number;
  /** Every cell's results, by id. */
  results: ReadonlyMap<string, CellResult>;
  /** The engine that evaluated them; null when the sheet could not be evaluated (the results say why). */
  engineVersion: string | null;
  /** The fingerprint of the sheet evaluated (null: not known, or not evaluated). */
  fingerprint: string | null;
}

/**
 * A saved change with its results, written together: the sheet goes from `version` to `version + 1` with
 * its results. `partial`: `results` holds only the cells evaluated afresh (and the edited one); the others'
 * stored results stay, which is right only while they are those of `version` by the same engine, of the
 * content whose fingerprint is `base`.
 */
export interface ChangeToStore {
  version: number;
  /** The states in which the sheet may still be changed. */
  states: readonly SheetState[];
  results: ReadonlyMap<string, CellResult>;
  partial: boolean;
  engineVersion: string | null;
  /** With `partial`: the fingerprint of the content whose stored results these complete. */
  base?: string;
  /** The fingerprint of the content saved, which these results are of (null: not known, or not evaluated). */
  fingerprint: string | null;
}

/** The sheet's row as a save finds it under its lock. */
export interface SaveLock {
  version: number;
  state: SheetState;
  resultsVersion: number | null;
  engineVersion: string | null;
  resultsFingerprint: string | null;
}

const parsedJson = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);

/**
 * A cell as the API shows it, without its results (the read splices the stored text in; a refused save sends none).
 * A stored cell was validated against its kind's schema when it was written, so its row is the typed cell.
 */
const rowView = (r: CellRow): CellDto =>
  ({
    id: r.id,
    position: r.position,
    kind: r.kind,
    fields: parsedJson(r.fields) as Record<string, unknown>,
    results: null,
    changedBy: r.changed_by,
    changedAt: new Date(r.changed_at).toISOString(),
    agreedBy: r.agreed_by,
    changedAfterAgreement: !!r.changed_after_agreement,
  }) as CellDto;

/** The co-preparers, and everyone who may not check or approve the revision (preparer, co-preparers, editors). */
function authorFields(preparerId: string, rows: readonly SheetRow[]): Pick<SheetDto, 'coPreparers' | 'authorIds'> {
  const authors = rows
    .flatMap((r) => (r.author_id ? [{ id: r.author_id, name: r.author_name ?? '', named: r.author_named }] : []))
    .sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return {
    coPreparers: authors
      .filter((a) => a.named)
      .map((a) => ({ id: a.id, name: a.name }))
      .sort((a, b) => a.name.localeCompare(b.name)),
    authorIds: [preparerId, ...authors.map((a) => a.id)],
  };
}

const BATCH = 200;

/** A cell as a save reads and changes it: its content, place and people, without its results. */
export interface CellRecord {
  id: string;
  position: number;
  kind: string;
  fields: Record<string, unknown>;
  changedById: string | null;
  changedBy: string | null;
  changedAt: Date;
  agreedById: string | null;
  agreedBy: string | null;
  agreedAt: Date | null;
  changedAfterAgreement: boolean;
}

/** What a save writes of its cells: new ones, those whose content or people changed, moved ones, removed ids. */
export interface CellWrites {
  inserted: CellRecord[];
  edited: CellRecord[];
  moved: CellRecord[];
  removed: string[];
}

/** The people of a sheet, selected by SHEET_OF_FIRM's joins. */
const PEOPLE_COLUMNS = 's.preparer_id, pu.name as preparer_name, s.checker_id, cu.name as checker_name, s.approver_id, au.name as approver_name';
/** A sheet of a firm (bound: sheet id, firm id) with its preparer, checker and approver. */
const SHEET_JOINS = `from sheet s join project p on p.id = s.project_id join app_user pu on pu.id = s.preparer_id
  left join app_user cu on cu.id = s.checker_id left join app_user au on au.id = s.approver_id`;
const OF_FIRM = 'where s.id = ? and p.firm_id = ?';
const SHEET_OF_FIRM = `${SHEET_JOINS} ${OF_FIRM}`;

interface PeopleRow {
  preparer_id: string;
  preparer_name: string;
  checker_id: string | null;
  checker_name: string | null;
  approver_id: string | null;
  approver_name: string | null;
}

const who = (personId: string | null, name: string | null) => (personId ? { id: personId, name: name ?? '' } : null);
const peopleOf = (r: PeopleRow) => ({
  preparer: { id: r.preparer_id, name: r.preparer_name },
  checker: who(r.checker_id, r.checker_name),
  approver: who(r.approver_id, r.approver_name),
});

/**
 * The open-query rule, written once: a query of sheet `s` is open while it is not closed and belongs to the
 * revision the sheet is being prepared as (queries of an issued revision stay with it). Alias `q` for cell_query.
 */
const OPEN_QUERY = "q.sheet_id = s.id and q.revision_number = s.revision_number and q.status <> 'closed'";

/**
 * The authors of the revision a sheet `s` is prepared as, besides its preparer (aliases a, au2): joined, one
 * row of the heading per author, rather than aggregated in a subquery — MariaDB builds a temporary table for
 * an aggregate of strings, which cost the hot read of a sheet a quarter of its time in the database.
 */
const AUTHOR_JOIN = 'left join sheet_author a on a.sheet_id = s.id and a.revision_number = s.revision_number left join app_user au2 on au2.id = a.user_id';

/** A sheet's heading as the API shows it (with SHEET_JOINS and AUTHOR_JOIN): its fields, people, open-query count and authors. */
const VIEW_HEADING_COLUMNS = `s.id, s.project_id, s.number, s.title, s.settings, s.state, s.version, s.engine_version, s.revision_number, ${PEOPLE_COLUMNS},
  (select count(*) from cell_query q where ${OPEN_QUERY}) as open_queries, a.user_id as author_id, au2.name as author_name, a.named as author_named`;
/** The columns of VIEW_HEADING_COLUMNS (the view's union fails at once, in every read, if this is wrong). */
const VIEW_HEADING_COLUMN_COUNT = 19;

/** The heading of a sheet from its heading rows (one per author, at least one). */
const viewHeading = (rows: readonly SheetRow[]): Omit<SheetDto, 'cells'> => {
  const [s] = rows;
  return {
    id: s.id,
    projectId: s.project_id,
    number: s.number,
    title: s.title,
    settings: parsedJson(s.settings) as Record<string, unknown>,
    state: s.state,
    version: s.version,
    engineVersion: s.engine_version ?? null,
    ...peopleOf(s),
    revisionNumber: s.revision_number,
    revisionCode: revisionCode(s.revision_number),
    openQueries: Number(s.open_queries),
    ...authorFields(s.preparer_id, rows),
  };
};

/** Who changed and who agreed each cell `c` (aliases ccu, cau). */
const CELL_PEOPLE = 'left join app_user ccu on ccu.id = c.changed_by_id left join app_user cau on cau.id = c.agreed_by_id';

/** As many nulls as VIEW_HEADING_COLUMNS has columns, for the cells' rows of the view's union. */
const HEADING_NULLS = Array.from({ length: VIEW_HEADING_COLUMN_COUNT }, () => 'null').join(', ');

/** A JSON string or null, written by MariaDB (JSON_QUOTE escapes as JSON requires). */
const jsonText = (expr: string) => `coalesce(json_quote(${expr}), 'null')`;

/**
 * A cell `c` as the API shows it (CellDto), written as JSON by MariaDB, as bytes: its fields and results are
 * spliced in as stored; `changedAt` is ISO 8601 in UTC with milliseconds, as Date#toISOString writes it (the
 * column holds UTC to the millisecond).
 */
const CELL_JSON = `cast(concat('{"id":', json_quote(c.id), ',"position":', c.position, ',"kind":', json_quote(c.kind), ',"fields":', c.fields,
  ',"results":', coalesce(c.results, 'null'), ',"changedBy":', ${jsonText('ccu.name')},
  ',"changedAt":"', date_format(c.changed_at, '%Y-%m-%dT%H:%i:%s.'), left(date_format(c.changed_at, '%f'), 3), 'Z"',
  ',"agreedBy":', ${jsonText('cau.name')}, ',"changedAfterAgreement":', if(c.changed_after_agreement, 'true', 'false'), '}') as binary)`;
const COMMA = Buffer.from(',');
const EMPTY = Buffer.alloc(0);
const CLOSE = Buffer.from(']}');

/**
 * The stamp of the cells of sheet `s`, a scalar subquery for the heading's columns: a SHA-256 over each cell's
 * SHA-256 of every column CELL_JSON reads — keep the two in step — in order of place, so it changes whenever
 * the cells' JSON would (SheetViewCache). Within a cell the parts are joined with commas: the id, place,
 * kind, time and flag have fixed forms without commas, and every part a user writes (fields, results, names)
 * enters as its own SHA-256, with '-' for NULL, so no two cells' parts join alike. Null when GROUP_CONCAT
 * would be cut at group_concat_max_len (64 characters a cell; then nothing is kept). SHA-256, not a shorter or
 * weaker hash: the content is the users', and two contents made to share a stamp would show a reader the
 * other. One level, in the select list: a derived table would be built as a temporary table on every read.
 */
const CELLS_STAMP = `(select if(count(*) * 64 <= @@group_concat_max_len, sha2(coalesce(group_concat(sha2(concat_ws(',', c.id, c.position, c.kind, c.changed_at, c.changed_after_agreement, ${[
  'c.fields',
  'c.results',
  'ccu.name',
  'cau.name',
]
  .map((part) => `coalesce(sha2(${part}, 256), '-')`)
  .join(', ')}), 256) order by c.position separator ''), ''), 256), null)
  from cell c ${CELL_PEOPLE} where c.sheet_id = s.id)`;

/** The JSON of a sheet's heading, up to the opening bracket of its cells. */
const headingJson = (rows: readonly SheetRow[]) => Buffer.from(`${JSON.stringify({ ...viewHeading(rows), cells: null }).slice(0, -'null}'.length)}[`);

/** The columns of a cell as a save changes it (aliases: c for cell, ccu and cau for who changed and agreed it). */
const CELL_RECORD_COLUMNS =
  'c.position, c.kind, c.fields, c.changed_at, c.changed_after_agreement, c.changed_by_id, ccu.name as changed_by, c.agreed_by_id, cau.name as agreed_by, c.agreed_at';

type CellRecordRow = CellRow & { cell_id?: string; changed_by_id: string | null; agreed_by_id: string | null; agreed_at: Date | string | null };

const cellRecord = (r: CellRecordRow): CellRecord => ({
  id: r.id,
  position: r.position,
  kind: r.kind,
  fields: parsedJson(r.fields) as Record<string, unknown>,
  changedById: r.changed_by_id,
  changedBy: r.changed_by,
  changedAt: new Date(r.changed_at),
  agreedById: r.agreed_by_id,
  agreedBy: r.agreed_by,
  agreedAt: r.agreed_at ? new Date(r.agreed_at) : null,
  changedAfterAgreement: !!r.changed_after_agreement,
});

/**
 * The cells' ids in order from GROUP_CONCAT, or undefined when MariaDB cut the list at group_concat_max_len
 * (its length is not that of every id and separator): the caller then reads the cells themselves.
 */
export function idList(row: { cell_ids?: string | null; cell_count?: number | string | null; cell_ids_length?: number | string | null }): string[] | undefined {
  if (!row.cell_ids) return Number(row.cell_count ?? 0) === 0 ? [] : undefined;
  return row.cell_ids.length === Number(row.cell_ids_length) ? row.cell_ids.split(',') : undefined;
}

const affected = (res: unknown) => (res as { affectedRows?: number }).affectedRows ?? 0;
const placeholders = (n: number) => Array.from({ length: n }, () => '?').join(', ');

export class SheetRepository extends EntityRepository<Sheet> {
  /** A sheet of a firm with its people loaded, or null (another firm's sheet is not found). */
  findInFirm(firmId: string, id: string): Promise<Sheet | null> {
    return this.findOne({ id, project: { firm: firmId } }, { populate: ['project', 'preparer', 'checker', 'approver'] });
  }

  /**
   * A sheet of a firm as a save needs it, without entities (another firm's sheet is null); with `cells`, its
   * cells as a save changes them too, read in the same statement — so they are the cells of the version read;
   * with `cell` (an id), only that cell as a save changes it and the ids of all, in order (a one-cell edit).
   */
  async heading(firmId: string, id: string, options: { cells?: boolean; cell?: string } = {}): Promise<SheetHeadingRow | null> {
    type Row = PeopleRow & {
      id: string;
      state: SheetState;
      version: number;
      revision_number: number;
      title: string;
      settings: unknown;
      extra: unknown;
      results_version: number | null;
      engine_version: string | null;
      results_fingerprint: string | null;
      cell_ids?: string | null;
      cell_count?: number | string | null;
      cell_ids_length?: number | string | null;
    };
    const oneCell = options.cell !== undefined && !options.cells;
    const columns = `s.id, s.state, s.version, s.revision_number, s.title, s.settings, s.extra, s.results_version, s.engine_version, s.results_fingerprint, ${PEOPLE_COLUMNS}`;
    const rows = await this.em.execute<(Row & Partial<CellRecordRow>)[]>(
      options.cells
        ? `select ${columns}, c.id as cell_id, ${CELL_RECORD_COLUMNS} ${SHEET_JOINS} left join cell c on c.sheet_id = s.id ${CELL_PEOPLE}
             ${OF_FIRM} order by c.position`
        : oneCell
          ? `select ${columns}, x.cell_ids, x.cell_count, x.cell_ids_length, c.id as cell_id, ${CELL_RECORD_COLUMNS} ${SHEET_JOINS}
               left join (select sheet_id, group_concat(id order by position separator ',') as cell_ids, count(*) as cell_count,
                                 sum(char_length(id)) + count(*) - 1 as cell_ids_length
                            from cell where sheet_id = ? group by sheet_id) x on x.sheet_id = s.id
               left join cell c on c.sheet_id = s.id and c.id = ? ${CELL_PEOPLE} ${OF_FIRM}`
          : `select ${columns} ${SHEET_OF_FIRM}`,
      oneCell ? [id, options.cell, id, firmId] : [id, firmId],
    );
    const [s] = rows;
    if (!s) return null;
    return {
      id: s.id,
      state: s.state,
      version: s.version,
      revisionNumber: s.revision_number,
      title: s.title,
      settings: parsedJson(s.settings) as Record<string, unknown>,
      extra: parsedJson(s.extra) as Record<string, unknown>,
      ...peopleOf(s),
      resultsVersion: s.results_version,
      engineVersion: s.engine_version,
      resultsFingerprint: s.results_fingerprint,
      ...(options.cells || oneCell ? { cells: rows.filter((r) => r.cell_id).map((r) => cellRecord({ ...(r as CellRecordRow), id: r.cell_id! })) } : {}),
      ...(oneCell ? { cellIds: idList(s) } : {}),
    };
  }

  /** A sheet of a firm as the API shows it (its JSON view parsed: for the answers of the other routes, not the hot read). */
  async view(firmId: string, id: string): Promise<SheetDto | null> {
    const json = await this.viewJson(firmId, id);
    return json && (JSON.parse(Buffer.concat(json).toString('utf8')) as SheetDto);
  }

  /**
   * A sheet of a firm as the API shows it, as JSON bytes in three parts: heading, cells, close (null: not this
   * firm's). The read of a sheet is the hot path: MariaDB writes each cell's JSON itself (CELL_JSON), passing its
   * fields and results through as it holds them (the text JSON.stringify wrote), so the app only joins bytes —
   * nothing is parsed and written again.
   * With a `cache`, a first statement reads the heading and the stamp of the cells as they are now
   * (CELLS_STAMP); when the cache holds the cells' JSON of that stamp, that is the answer with the fresh
   * heading, and the cells are not read. Otherwise one statement reads all: the heading with the stamp first (a
   * row per author), the cells the rows after it, in order — one snapshot, so the JSON kept is that stamp's.
   */
  async viewJson(firmId: string, id: string, cache?: SheetViewCache): Promise<Buffer[] | null> {
    if (cache) {
      const heading = await this.em.execute<(SheetRow & { cells_stamp: string | null })[]>(
        `select ${VIEW_HEADING_COLUMNS}, ${CELLS_STAMP} as cells_stamp ${SHEET_JOINS} ${AUTHOR_JOIN} ${OF_FIRM}`,
        [id, firmId],
      );
      if (!heading.length) return null;
      const stamp = heading[0].cells_stamp;
      const cells = stamp ? cache.get(id, stamp) : undefined;
      if (cells) return [headingJson(heading), cells, CLOSE];
    }
    const rows = await this.em.execute<(Partial<SheetRow> & { part: number; place: number; cell_json: Buffer | null; cells_stamp: string | null })[]>(
      `select 0 as part, -1 as place, ${VIEW_HEADING_COLUMNS}, null as cell_json, ${cache ? CELLS_STAMP : 'null'} as cells_stamp
         ${SHEET_JOINS} ${AUTHOR_JOIN} ${OF_FIRM}
       union all
       select 1, c.position, ${HEADING_NULLS}, ${CELL_JSON} as cell_json, null
         from cell c join sheet s on s.id = c.sheet_id join project p on p.id = s.project_id ${CELL_PEOPLE}
        where c.sheet_id = ? and p.firm_id = ?`,
      [id, firmId, id, firmId],
    );
    // In order by hand: an ORDER BY over the union would copy every cell's JSON into a temporary table to sort it.
    rows.sort((a, b) => a.part - b.part || a.place - b.place);
    const first = rows.findIndex((r) => r.part !== 0);
    const heading = (first < 0 ? rows : rows.slice(0, first)) as SheetRow[];
    if (!heading.length) return null;
    const parts: Buffer[] = [];
    for (let k = heading.length; k < rows.length; k++) parts.push(k > heading.length ? COMMA : EMPTY, rows[k].cell_json!);
    const cells = Buffer.concat(parts);
    const stamp = rows[0].cells_stamp;
    if (cache && stamp) cache.set(id, stamp, cells);
    return [headingJson(heading), cells, CLOSE];
  }

  /** What an editor needs to merge after its save was refused as stale: the version and the cells' content now. */
  async contents(sheetId: string): Promise<SheetContentsDto | null> {
    const [row] = await this.em.execute<{ version: number; state: SheetState }[]>('select version, state from sheet where id = ?', [sheetId]);
    if (!row) return null;
    const rows = await this.em.execute<CellRow[]>(
      `select c.id, c.position, c.kind, c.fields, c.changed_at, c.changed_after_agreement, ccu.name as changed_by, cau.name as agreed_by
         from cell c ${CELL_PEOPLE} where c.sheet_id = ? order by c.position`,
      [sheetId],
    );
    // Without results: the editor keeps those of the cells whose content it has.
    return { version: row.version, state: row.state, cells: rows.map(rowView) };
  }

  /**
   * The usual save — one cell edited — in one statement: the cell's content, the results given and the
   * sheet's version, results version and engine, written only while the sheet is at `version` in one of
   * `states` (so of two saves exactly one wins, and none lands on a sheet just passed or approved) and, for
   * partial results, while its stored results are those of `version` by the same engine. False when it did
   * not match (the caller takes the transaction, which says why).
   */
  async saveCellEdit(sheetId: string, cell: CellRecord, change: ChangeToStore): Promise<boolean> {
    const ids = [...new Set([cell.id, ...change.results.keys()])];
    if (ids.length > BATCH) return false;
    const edited = (column: string) => `c.${column} = if(c.id = ?, ?, c.${column})`;
    const columns = ['kind', 'fields', 'changed_by_id', 'changed_at', 'agreed_by_id', 'agreed_at', 'changed_after_agreement'];
    const values = [cell.kind, JSON.stringify(cell.fields), cell.changedById, cell.changedAt, cell.agreedById, cell.agreedAt, cell.changedAfterAgreement];
    const results = [...change.results];
    const res = await this.em.execute(
      `update sheet s join cell c on c.sheet_id = s.id and c.id in (${placeholders(ids.length)})
          set ${columns.map(edited).join(', ')},
              c.results = ${results.length ? `case c.id ${results.map(() => 'when ? then ?').join(' ')} else c.results end` : 'c.results'},
              s.version = ?, s.results_version = ?, s.engine_version = coalesce(?, s.engine_version), s.results_fingerprint = ?, s.updated_at = ?
        where s.id = ? and s.version = ? and s.state in (${placeholders(change.states.length)})
              ${change.partial ? 'and s.results_version = ? and s.engine_version = ? and s.results_fingerprint = ?' : ''}`,
      [
        ...ids,
        ...values.flatMap((v) => [cell.id, v]),
        ...results.flatMap(([id, r]) => [id, JSON.stringify(r)]),
        ...this.raised(change),
        change.fingerprint,
        new Date(),
        sheetId,
        change.version,
        ...change.states,
        ...(change.partial ? [change.version, change.engineVersion, change.base ?? ''] : []),
      ],
      'run',
    );
    return affected(res) > 0;
  }

  /** The version, results version and engine a save sets: when evaluation failed, the results version is unknown and the engine kept. */
  private raised(change: Pick<ChangeToStore, 'version' | 'engineVersion'>): [number, number | null, string | null] {
    return [change.version + 1, change.engineVersion === null ? null : change.version + 1, change.engineVersion];
  }

  /** Locks a sheet's row for a save's transaction and says where it stands (null: deleted). */
  async lockForSave(sheetId: string): Promise<SaveLock | null> {
    const [row] = await this.em.execute<
      { version: number; state: SheetState; results_version: number | null; engine_version: string | null; results_fingerprint: string | null }[]
    >('select version, state, results_version, engine_version, results_fingerprint from sheet where id = ? for update', [sheetId]);
    return row
      ? {
          version: row.version,
          state: row.state,
          resultsVersion: row.results_version,
          engineVersion: row.engine_version,
          resultsFingerprint: row.results_fingerprint,
        }
      : null;
  }

  /** In a save's transaction, under lockForSave: raises the version and writes the results given. */
  async raiseWithResults(sheetId: string, change: Pick<ChangeToStore, 'version' | 'results' | 'engineVersion' | 'fingerprint'>): Promise<void> {
    await this.setByCell(
      sheetId,
      'results',
      [...change.results].map(([id, r]) => [id, JSON.stringify(r)]),
    );
    await this.em.execute(
      'update sheet set version = ?, results_version = ?, engine_version = coalesce(?, engine_version), results_fingerprint = ?, updated_at = ? where id = ?',
      [...this.raised(change), change.fingerprint, new Date(), sheetId],
      'run',
    );
  }

  /** Writes what a save changed of a sheet's cells (in the caller's transaction). */
  async writeCells(sheetId: string, writes: CellWrites): Promise<void> {
    const run = (sql: string, params: unknown[]) => this.em.execute(sql, params, 'run');
    if (writes.removed.length)
      await run(`delete from cell where sheet_id = ? and id in (${placeholders(writes.removed.length)})`, [sheetId, ...writes.removed]);
    for (const c of writes.edited) {
      await run(
        'update cell set kind = ?, fields = ?, changed_by_id = ?, changed_at = ?, agreed_by_id = ?, agreed_at = ?, changed_after_agreement = ? where sheet_id = ? and id = ?',
        [c.kind, JSON.stringify(c.fields), c.changedById, c.changedAt, c.agreedById, c.agreedAt, c.changedAfterAgreement, sheetId, c.id],
      );
    }
    await this.setByCell(
      sheetId,
      'position',
      writes.moved.map((c) => [c.id, c.position]),
    );
    for (const c of writes.inserted) {
      await run('insert into cell (id, sheet_id, position, kind, fields, changed_by_id, changed_at, changed_after_agreement) values (?, ?, ?, ?, ?, ?, ?, ?)', [
        c.id,
        sheetId,
        c.position,
        c.kind,
        JSON.stringify(c.fields),
        c.changedById,
        c.changedAt,
        c.changedAfterAgreement,
      ]);
    }
  }

  /** Sets one column of many cells of a sheet, each to its own value, in batches of one statement each. */
  private async setByCell(sheetId: string, column: 'position' | 'results', values: [string, unknown][]): Promise<void> {
    for (let k = 0; k < values.length; k += BATCH) {
      const batch = values.slice(k, k + BATCH);
      await this.em.execute(
        `update cell set ${column} = case id ${batch.map(() => 'when ? then ?').join(' ')} end where sheet_id = ? and id in (${placeholders(batch.length)})`,
        [...batch.flat(), sheetId, ...batch.map(([id]) => id)],
        'run',
      );
    }
  }

  /** A sheet's title and settings, as a save changed them (in the caller's transaction). */
  async writeHeading(sheetId: string, heading: { title: string; settings: Record<string, unknown> }): Promise<void> {
    await this.em.execute('update sheet set title = ?, settings = ? where id = ?', [heading.title, JSON.stringify(heading.settings), sheetId], 'run');
  }

  /**
   * Stores the results of an evaluation of every cell (a new sheet, or one evaluated afresh), only while the
   * sheet is still at the version evaluated (its row locked): a later save stores its own with its change,
   * so older results never overwrite newer ones. False when a save had moved the sheet on.
   */
  async storeResults(sheetId: string, store: ResultsToStore): Promise<boolean> {
    return this.em.transactional(async (em) => {
      const [row] = await em.execute<{ version: number }[]>('select version from sheet where id = ? for update', [sheetId]);
      if (row?.version !== store.version) return false;
      await this.setByCell(
        sheetId,
        'results',
        [...store.results].map(([id, r]) => [id, JSON.stringify(r)]),
      );
      await em.execute(
        'update sheet set results_version = ?, engine_version = coalesce(?, engine_version), results_fingerprint = ? where id = ?',
        [store.engineVersion === null ? null : store.version, store.engineVersion, store.engineVersion === null ? null : store.fingerprint, sheetId],
        'run',
      );
      return true;
    });
  }

  /** Queries not closed, by sheet, for the revision each sheet is being prepared as. */
  async openQueryCounts(sheetIds: readonly string[]): Promise<Map<string, number>> {
    const counts = new Map<string, number>();
    if (!sheetIds.length) return counts;
    const rows = await this.em.execute<{ sheet_id: string; open: number | string }[]>(
      `select s.id as sheet_id, count(*) as open from sheet s join cell_query q on ${OPEN_QUERY}
        where s.id in (${placeholders(sheetIds.length)}) group by s.id`,
      [...sheetIds],
    );
    for (const r of rows) counts.set(r.sheet_id, Number(r.open));
    return counts;
  }

  /** Open queries of one sheet (in the caller's transaction: the pass of a check counts them under the lock). */
  async openQueriesOf(sheetId: string): Promise<number> {
    const [row] = await this.em.execute<{ n: number | string }[]>(`select count(*) as n from sheet s join cell_query q on ${OPEN_QUERY} where s.id = ?`, [
      sheetId,
    ]);
    return Number(row?.n ?? 0);
  }

  /** Open queries over a project's sheets. */
  async openQueriesOfProject(projectId: string): Promise<number> {
    const [row] = await this.em.execute<{ n: number | string }[]>(
      `select count(*) as n from sheet s join cell_query q on ${OPEN_QUERY} where s.project_id = ?`,
      [projectId],
    );
    return Number(row?.n ?? 0);
  }
}
