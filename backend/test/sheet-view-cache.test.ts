/**
 * The read of a sheet keeps its cells' JSON by a stamp MariaDB computes from every column that JSON is made
 * of, and sends the kept bytes only while the stamp is the same. Here every one of those columns is changed
 * behind the app's back (raw SQL, as another path or another instance would), and each read after must
 * show the change — the same bytes as a read that keeps nothing.
 */
import { EntityManager } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { Sheet } from '../src/sheets/entities/sheet.entity';
import type { SheetRepository } from '../src/sheets/sheet.repository';
import { SheetViewCache } from '../src/sheets/sheet-view-cache';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

describe('the kept cells of a sheet read', () => {
  let app: INestApplication;
  let engineer: Caller;
  let outsider: Caller;
  let sheetId: string;
  let cellIds: string[];

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    outsider = await makeCaller(app, ['engineer']);
    const project = (
      await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'V-1', title: 'Kept views', clientOrganisation: 'Client', site: 'Site' }).expect(201)
    ).body;
    const created = await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`)
      .send({
        number: 'V-101',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'Kept',
          cells: [
            { kind: 'calc', source: 'a = 2 V' },
            { kind: 'calc', source: 'b = a / 4 ohm' },
            { kind: 'check', condition: 'b <= 1 A', basis: 'common practice' },
          ],
        },
      })
      .expect(201);
    sheetId = created.body.id;
    cellIds = created.body.cells.map((c: { id: string }) => c.id);
  });
  afterAll(async () => {
    await app?.close();
  });

  const sql = (statement: string, params: unknown[]) => app.get(EntityManager).fork().getConnection().execute(statement, params, 'run');
  /** The sheet as a read that keeps nothing gives it. */
  const uncached = async () => {
    const repository = app.get(EntityManager).fork().getRepository(Sheet) as SheetRepository;
    return Buffer.concat((await repository.viewJson(engineer.firm.id, sheetId))!).toString('utf8');
  };
  const read = async () => (await as(app, engineer, 'get', `/api/sheets/${sheetId}`).expect(200)).text;

  it('sends the kept bytes while nothing changed, and a firm that does not hold the sheet gets 404 all the same', async () => {
    const cache = app.get(SheetViewCache);
    const first = await read();
    const get = vi.spyOn(cache, 'get');
    const second = await read();
    expect(second).toBe(first);
    expect(get).toHaveBeenCalledTimes(1);
    expect(get.mock.results[0].value).toBeInstanceOf(Buffer);
    get.mockRestore();
    await as(app, outsider, 'get', `/api/sheets/${sheetId}`).expect(404);
  });

  it('reads every author of the revision, one heading row each, alike whether the cells are kept or not', async () => {
    const named = [await makeCaller(app, ['engineer'], engineer.firm), await makeCaller(app, ['engineer'], engineer.firm)];
    await sql('update app_user set name = ? where id = ?', ['Zora Second', named[0].user.id]);
    await sql('update app_user set name = ? where id = ?', ['Abel First', named[1].user.id]);
    await as(app, engineer, 'put', `/api/sheets/${sheetId}/co-preparers`)
      .send({ userIds: named.map((c) => c.user.id) })
      .expect(200);
    await read(); // kept
    const body = await read();
    expect(body).toBe(await uncached());
    const sheet = JSON.parse(body) as { coPreparers: { name: string }[]; authorIds: string[]; cells: unknown[] };
    expect(sheet.coPreparers.map((c) => c.name)).toEqual(['Abel First', 'Zora Second']);
    expect(sheet.authorIds).toEqual([engineer.user.id, ...named.map((c) => c.user.id).sort()]);
    // Each cell once, whatever the number of heading rows.
    expect(sheet.cells).toHaveLength(cellIds.length);
    await as(app, engineer, 'put', `/api/sheets/${sheetId}/co-preparers`).send({ userIds: [] }).expect(200);
    expect(JSON.parse(await read()).coPreparers).toEqual([]);
  });

  it('shows every change to a column of the cells, made by any path, at the next read', async () => {
    const changes: [string, string, unknown[], (body: { cells: Record<string, unknown>[]; title: string }) => unknown, unknown][] = [
      [
        'fields',
        'update cell set fields = ? where id = ?',
        [JSON.stringify({ source: 'a = 3 V' }), cellIds[0]],
        (b) => b.cells[0].fields,
        { source: 'a = 3 V' },
      ],
      [
        'results',
        'update cell set results = ? where id = ?',
        [JSON.stringify({ kind: 'note', status: 'ok', errors: [], warnings: [] }), cellIds[1]],
        (b) => b.cells[1].results,
        { kind: 'note', status: 'ok', errors: [], warnings: [] },
      ],
      ['no results', 'update cell set results = null where id = ?', [cellIds[1]], (b) => b.cells[1].results, null],
      ['kind', "update cell set kind = 'note', fields = ? where id = ?", [JSON.stringify({ text: 'n' }), cellIds[2]], (b) => b.cells[2].kind, 'note'],
      ['position', 'update cell set position = 7 where id = ?', [cellIds[2]], (b) => b.cells[2].position, 7],
      [
        'changed at',
        'update cell set changed_at = ? where id = ?',
        [new Date('2026-05-04T03:02:01.123Z'), cellIds[0]],
        (b) => b.cells[0].changedAt,
        '2026-05-04T03:02:01.123Z',
      ],
      ['nobody changed', 'update cell set changed_by_id = null where id = ?', [cellIds[0]], (b) => b.cells[0].changedBy, null],
      ['changed by', 'update cell set changed_by_id = ? where id = ?', [engineer.user.id, cellIds[0]], (b) => b.cells[0].changedBy, 'Test person'],
      ['a name', 'update app_user set name = ? where id = ?', ['Renamed Person', engineer.user.id], (b) => b.cells[0].changedBy, 'Renamed Person'],
      ['agreed by', 'update cell set agreed_by_id = ? where id = ?', [engineer.user.id, cellIds[1]], (b) => b.cells[1].agreedBy, 'Renamed Person'],
      ['changed after agreement', 'update cell set changed_after_agreement = 1 where id = ?', [cellIds[1]], (b) => b.cells[1].changedAfterAgreement, true],
      ['a cell removed', 'delete from cell where id = ?', [cellIds[2]], (b) => b.cells.length, 2],
      ['the title', "update sheet set title = 'Renamed' where id = ?", [sheetId], (b) => b.title, 'Renamed'],
    ];
    for (const [what, statement, params, pick, expected] of changes) {
      await read(); // kept as it is
      await sql(statement, params);
      const body = await read();
      expect(pick(JSON.parse(body)), what).toEqual(expected);
      expect(body, what).toBe(await uncached());
    }
  });
});
