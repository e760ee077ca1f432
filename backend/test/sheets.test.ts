import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, makeCaller, type Caller } from './support/sessions';
import { expectStoredAsFresh, savedResults } from './support/stored-results';
import { createTestApp } from './support/test-app';

describe('projects and sheets', () => {
  let app: INestApplication;
  let engineer: Caller;
  let checker: Caller;
  let outsider: Caller;
  let projectId: string;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    checker = await makeCaller(app, ['checker'], engineer.firm);
    outsider = await makeCaller(app, ['owner', 'engineer']);
    const res = await as(app, engineer, 'post', '/api/projects')
      .send({ jobNumber: 'J-1001', title: 'Test project', clientOrganisation: 'Test client', site: 'Test site' })
      .expect(201);
    projectId = res.body.id;
  });
  afterAll(async () => {
    await app?.close();
  });

  it('keeps job numbers unique in the firm, with the message beside the field', async () => {
    const res = await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'J-1001', title: 'Again', clientOrganisation: 'X', site: 'Y' }).expect(409);
    expect(res.body.details).toEqual([{ field: 'jobNumber', message: 'this job number is taken' }]);
    await as(app, outsider, 'post', '/api/projects').send({ jobNumber: 'J-1001', title: 'Other firm', clientOrganisation: 'X', site: 'Y' }).expect(201);
  });

  it('keeps a project team of firm members, starting with its creator, and lists its invited clients', async () => {
    const people = (await as(app, checker, 'get', `/api/projects/${projectId}/people`).expect(200)).body;
    expect(people.members.map((m: { id: string }) => m.id)).toEqual([engineer.user.id]);
    expect(people.clients).toEqual([]);
    const set = (
      await as(app, engineer, 'put', `/api/projects/${projectId}/members`)
        .send({ userIds: [engineer.user.id, checker.user.id] })
        .expect(200)
    ).body;
    expect(set.members.map((m: { id: string }) => m.id).sort()).toEqual([engineer.user.id, checker.user.id].sort());
    expect(set.members.find((m: { id: string }) => m.id === checker.user.id).roles).toEqual(['checker']);
    // Someone of another firm cannot be put on the team, and nothing changes.
    const bad = await as(app, engineer, 'put', `/api/projects/${projectId}/members`)
      .send({ userIds: [outsider.user.id] })
      .expect(400);
    expect(bad.body.message).toMatch(/not a member of the firm/);
    await as(app, engineer, 'put', `/api/projects/${projectId}/members`)
      .send({ userIds: ['x'] })
      .expect(400);
    expect((await as(app, engineer, 'get', `/api/projects/${projectId}/people`)).body.members).toHaveLength(2);
    await as(app, outsider, 'get', `/api/projects/${projectId}/people`).expect(404);
  });

  it('validates project fields', async () => {
    const res = await as(app, engineer, 'post', '/api/projects').send({ jobNumber: '', title: 'x' }).expect(400);
    expect(res.body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['jobNumber', 'clientOrganisation', 'site']));
  });

  it('creates a sheet from a template, evaluated and stored, and exports it in the sheet format', async () => {
    const res = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'C-101', templateId: 'series-rlc-steady-state' })
      .expect(201);
    expect(res.body).toMatchObject({ number: 'C-101', state: 'being-prepared', version: 1 });
    const calc = res.body.cells.find((c: { kind: string; results: { values?: Record<string, unknown> } }) => c.kind === 'calc' && c.results?.values?.Z);
    expect(calc.results.values.Z.si).toBeCloseTo(13.0456, 3);
    const exported = await as(app, checker, 'get', `/api/sheets/${res.body.id}/export`).expect(200);
    expect(exported.body.format).toBe('ampwright.sheet/1');
    expect(exported.body.cells.length).toBe(res.body.cells.length);
    const evaluated = await as(app, engineer, 'post', '/api/evaluate').send(exported.body).expect(200);
    expect(evaluated.body.cells[2].values.Z.si).toBeCloseTo(calc.results.values.Z.si, 12);
  });

  it("reads a sheet as JSON with each cell's stored results passed through: the same sheet as the answer that made it", async () => {
    const made = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'R-101', templateId: 'bank-inrush-transient' })
      .expect(201);
    const read = await as(app, checker, 'get', `/api/sheets/${made.body.id}`).expect(200);
    expect(read.headers['content-type']).toMatch(/^application\/json/);
    expect(read.body).toEqual(made.body);
    // The transient's series arrive as the numbers stored, to the last digit.
    const transient = read.body.cells.find((c: { kind: string }) => c.kind === 'transient');
    expect(transient.results.current.values.length).toBeGreaterThan(100);
    expect(JSON.stringify(transient.results)).toBe(JSON.stringify(made.body.cells.find((c: { kind: string }) => c.kind === 'transient').results));
  });

  it('reads each cell as the save that wrote it answered it: text with quotes, backslashes, tabs and accents, people and times', async () => {
    const made = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'R-102', sheet: { format: 'ampwright.sheet/1', title: 'Escapes', cells: [{ kind: 'note', text: 'first' }] } })
      .expect(201);
    const text = 'A "quoted" word, a back\\slash, a\ttab, a line\nbreak, é, Ω, 🙂 and \u0001';
    const saved = await as(app, engineer, 'patch', `/api/sheets/${made.body.id}/cells/${made.body.cells[0].id}`)
      .send({ version: made.body.version, cell: { kind: 'note', text } })
      .expect(200);
    const read = (await as(app, engineer, 'get', `/api/sheets/${made.body.id}`).expect(200)).body;
    // The answer is built by the app, the read by MariaDB: the same cell, field by field.
    expect(read.cells[0]).toEqual(saved.body.changed[0]);
    expect(read.cells[0].fields.text).toBe(text);
    expect(read.cells[0].changedAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    expect(read.cells[0]).toMatchObject({ changedBy: expect.any(String), agreedBy: null, changedAfterAgreement: false });
  });

  it('saves a sheet as a firm template, offers it beside the built-in ones, and starts new sheets from it', async () => {
    const from = (
      await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
        .send({
          number: 'T-1',
          sheet: { format: 'ampwright.sheet/1', title: 'Our branch check', cells: [{ kind: 'calc', source: 'R = 3 ohm\nX = 4 ohm\nZ = sqrt(R^2 + X^2)' }] },
        })
        .expect(201)
    ).body;
    const saved = (await as(app, engineer, 'post', '/api/templates').send({ sheetId: from.id, title: 'Firm branch check' }).expect(201)).body;
    expect(saved).toMatchObject({ title: 'Firm branch check', cellCount: 1, source: 'firm' });
    const list = (await as(app, checker, 'get', '/api/templates').expect(200)).body as { id: string; source: string }[];
    expect(list.filter((t) => t.source === 'built-in').length).toBeGreaterThanOrEqual(6);
    expect(list.map((t) => t.id)).toContain(saved.id);
    const made = (await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'T-2', templateId: saved.id }).expect(201)).body;
    expect(made.title).toBe('Firm branch check');
    expect(made.cells[0].results.values.Z.si).toBeCloseTo(5, 12); // 3-4-5 (Pythagoras)
    // Another firm neither sees nor uses it, and a built-in template cannot be removed.
    expect(((await as(app, outsider, 'get', '/api/templates')).body as { id: string }[]).map((t) => t.id)).not.toContain(saved.id);
    const outsiderProject = (await as(app, outsider, 'get', '/api/projects')).body[0];
    await as(app, outsider, 'post', `/api/projects/${outsiderProject.id}/sheets`).send({ number: 'X-1', templateId: saved.id }).expect(404);
    await as(app, engineer, 'post', '/api/templates').send({ sheetId: 'nope' }).expect(400);
    await as(app, engineer, 'delete', `/api/templates/${saved.id}`).expect(204);
    expect(((await as(app, engineer, 'get', '/api/templates')).body as { id: string }[]).map((t) => t.id)).not.toContain(saved.id);
  });

  it('imports a sheet file, keeping fields it does not know', async () => {
    const sheet = { format: 'ampwright.sheet/1', title: 'Imported', reviewNote: 'keep me', cells: [{ kind: 'note', text: 'hello', colour: 'teal' }] };
    const res = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'C-102', sheet }).expect(201);
    const exported = await as(app, engineer, 'get', `/api/sheets/${res.body.id}/export`).expect(200);
    expect(exported.body).toMatchObject({ reviewNote: 'keep me', cells: [{ kind: 'note', text: 'hello', colour: 'teal' }] });
    const bad = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'C-103', sheet: { format: 'nope' } })
      .expect(400);
    expect(bad.body.details[0].field).toBe('sheet.format');
  });

  it('re-evaluates after each saved change and returns the cells whose results changed', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'C-104', title: 'Edits' }).expect(201);
    const id = created.body.id;
    const a = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 1, position: 0, cell: { kind: 'calc', source: 'R = 10 ohm' } })
      .expect(201);
    const b = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 2, position: 1, cell: { kind: 'calc', source: 'P = R * (2 A)^2' } })
      .expect(201);
    expect(b.body.version).toBe(3);
    expect(b.body.changed[0].results.values.P.si).toBe(40);
    const rId = a.body.changed[0].id;
    const edit = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${rId}`)
      .send({ version: 3, cell: { kind: 'calc', source: 'R = 12 ohm' } })
      .expect(200);
    // The edited cell comes whole; the cell that reads it, with its new results only (its content is unchanged).
    expect(edit.body.changed.map((c: { id: string }) => c.id)).toEqual([rId]);
    const p = edit.body.reevaluated.find((c: { id: string }) => c.id !== rId);
    expect(p.results.values.P.si).toBe(48);
    const moved = await as(app, engineer, 'post', `/api/sheets/${id}/cells/${rId}/move`).send({ version: 4, position: 1 }).expect(200);
    expect(moved.body.changed.find((c: { id: string }) => c.id === p.id).results.errors[0].message).toMatch(/R is used before it is defined/);
    const removed = await as(app, engineer, 'delete', `/api/sheets/${id}/cells/${rId}?version=5`).expect(200);
    expect(removed.body.removed).toEqual([rId]);
    const sheet = await as(app, checker, 'get', `/api/sheets/${id}`).expect(200);
    expect(sheet.body.version).toBe(6);
    expect(sheet.body.cells).toHaveLength(1);
  });

  it('refuses a stale save with 409 and what the editor needs to merge, and of two saves at once exactly one wins', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'C-105', title: 'Race' }).expect(201);
    const id = created.body.id;
    const first = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 1, position: 0, cell: { kind: 'calc', source: 'x = 1' } })
      .expect(201);
    const cellId = first.body.changed[0].id;
    const [r1, r2] = await Promise.all([
      as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`).send({ version: 2, cell: { kind: 'calc', source: 'x = 2' } }),
      as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`).send({ version: 2, cell: { kind: 'calc', source: 'x = 3' } }),
    ]);
    expect([r1.status, r2.status].sort()).toEqual([200, 409]);
    const loser = r1.status === 409 ? r1 : r2;
    expect(loser.body.code).toBe('STALE_VERSION');
    expect(loser.body.current.version).toBe(3);
    const now = await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200);
    expect(loser.body.current.cells[0].fields.source).toBe(now.body.cells[0].fields.source);
    // The cells' content, order and state: not the whole sheet, and no results.
    expect(Object.keys(loser.body.current).sort()).toEqual(['cells', 'state', 'version']);
    expect(loser.body.current.cells[0]).toMatchObject({ id: cellId, position: 0, results: null });
    expect(['x = 2', 'x = 3']).toContain(now.body.cells[0].fields.source);
  });

  it('saves a change whose evaluation is stopped, and shows the reason in every cell instead of older numbers', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number: 'C-108',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'Runaway',
          cells: [
            { kind: 'calc', source: 'x = 1' },
            { kind: 'check', condition: 'x <= 2', basis: 'probe' },
          ],
        },
      })
      .expect(201);
    const [calc, check] = created.body.cells;
    expect(check.results.pass).toBe(true);
    // Some 20 products of a 316 × 316 matrix: far past the 2 s deadline (see evaluation.test.ts).
    const runaway = 'x = 1\nM = ones(316, 316)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M';
    const saved = await as(app, engineer, 'patch', `/api/sheets/${created.body.id}/cells/${calc.id}`)
      .send({ version: created.body.version, cell: { kind: 'calc', source: runaway } })
      .expect(200);
    expect(saved.body.version).toBe(created.body.version + 1);
    const now = (await as(app, engineer, 'get', `/api/sheets/${created.body.id}`).expect(200)).body;
    expect(now.cells[0].fields.source).toBe(runaway);
    for (const cell of now.cells) {
      expect(cell.results).toMatchObject({ kind: 'unevaluated', status: 'error' });
      expect(cell.results.errors[0].message).toMatch(/^Not evaluated: This sheet takes longer than a sheet may take \(2 s\)/);
      expect(cell.results.pass).toBeUndefined();
    }
    const fixed = await as(app, engineer, 'patch', `/api/sheets/${created.body.id}/cells/${calc.id}`)
      .send({ version: saved.body.version, cell: { kind: 'calc', source: 'x = 3' } })
      .expect(200);
    expect(savedResults(fixed.body, check.id)).toMatchObject({ kind: 'check', pass: false });
  });

  it('stores a change with its results at once: no read shows a version with results of another', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'C-109', sheet: { format: 'ampwright.sheet/1', title: 'Order', cells: [{ kind: 'calc', source: 'a = 1' }] } })
      .expect(201);
    const id = created.body.id;
    const cellId = created.body.cells[0].id;
    // The save evaluates for a moment (six 160 × 160 products); readers look all the while.
    const slowSource = 'a = 5\nM = ones(160, 160)\nP = M * M * M * M * M * M';
    const slow = as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
      .send({ version: 1, cell: { kind: 'calc', source: slowSource } })
      .then((r) => r);
    const seen: { version: number; source: string; a: number | string }[] = [];
    for (let k = 0; k < 200 && !seen.some((s) => s.version === 2); k++) {
      const cell = (await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200)).body;
      seen.push({
        version: cell.version,
        source: cell.cells[0].fields.source,
        a: cell.cells[0].results?.values?.a?.si ?? JSON.stringify(cell.cells[0].results).slice(0, 200),
      });
    }
    expect((await slow).status).toBe(200);
    expect(seen.length).toBeGreaterThan(1);
    for (const s of seen) expect(s).toEqual(s.version === 1 ? { version: 1, source: 'a = 1', a: 1 } : { version: 2, source: slowSource, a: 5 });
    const fast = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
      .send({ version: 2, cell: { kind: 'calc', source: 'a = 6' } })
      .expect(200);
    expect(fast.body.changed[0].results.values.a.si).toBe(6);
    const now = (await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200)).body;
    expect(now.cells[0].results.values).toEqual({ a: expect.objectContaining({ si: 6 }) });
  });

  it('stores, after every kind of change, exactly the results a fresh evaluation gives', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number: 'C-110',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'Incremental',
          cells: [
            { kind: 'calc', source: 'a = 1 A' },
            { kind: 'calc', source: 'b = a * 2 ohm' },
            { kind: 'check', condition: 'b <= 3 V', basis: 'probe' },
          ],
        },
      })
      .expect(201);
    const id = created.body.id;
    let version = created.body.version;
    const [a, b] = created.body.cells;
    const save = async (req: Promise<{ body: { version: number } }>) => {
      version = (await req).body.version;
      return expectStoredAsFresh(app, engineer, id);
    };
    // A cell with the same content as the one after it, at that one's place: the cache's entry for the
    // place matches it, so only what the change touched tells which cell's results to write.
    await save(
      as(app, engineer, 'post', `/api/sheets/${id}/cells`)
        .send({ version, position: 1, cell: { kind: 'calc', source: 'b = a * 2 ohm' } })
        .expect(201),
    );
    await save(
      as(app, engineer, 'patch', `/api/sheets/${id}/cells/${a.id}`)
        .send({ version, cell: { kind: 'calc', source: 'a = 2 A' } })
        .expect(200),
    );
    await save(as(app, engineer, 'post', `/api/sheets/${id}/cells/${b.id}/move`).send({ version, position: 0 }).expect(200));
    await save(as(app, engineer, 'delete', `/api/sheets/${id}/cells/${b.id}?version=${version}`).expect(200));
    await save(
      as(app, engineer, 'patch', `/api/sheets/${id}`)
        .send({ version, settings: { significantDigits: 6 } })
        .expect(200),
    );
    const last = await save(
      as(app, engineer, 'patch', `/api/sheets/${id}/cells/${a.id}`)
        .send({ version, cell: { kind: 'calc', source: 'a = 1 A' } })
        .expect(200),
    );
    expect(last.cells.at(-1).results).toMatchObject({ kind: 'check', pass: true });
  });

  it('saves back an edited table of 20 000 rows × 10 columns (a body of several MB), and refuses one over 200 000 values naming the limit', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'T-200', title: 'Wide table' }).expect(201);
    const id = created.body.id;
    const columns = Array.from({ length: 10 }, (_, j) => ({ name: `c${j}`, unit: 'A' }));
    // Seventeen significant digits a value: about 4 MB of JSON, more than the 2 MB other routes take.
    const rows = Array.from({ length: 20_000 }, (_, i) => columns.map((_c, j) => (i + 1) * (j + 1) * 1.0000000000000002 + 0.123456789012345));
    const added = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 1, position: 0, cell: { kind: 'table', columns, rows } })
      .expect(201);
    rows[19_999][9] = 7.5;
    const edited = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${added.body.changed[0].id}`)
      .send({ version: 2, cell: { kind: 'table', columns, rows } })
      .expect(200);
    expect(edited.body.version).toBe(3);
    const read = await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200);
    expect(read.body.cells[0].fields.rows[19_999][9]).toBe(7.5);
    const wider = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${added.body.changed[0].id}`)
      .send({ version: 3, cell: { kind: 'table', columns: [...columns, { name: 'c10' }], rows: rows.map((r) => [...r, 1]) } })
      .expect(400);
    expect(wider.body).toMatchObject({ code: 'INVALID_CELL', details: [{ field: 'cell.rows', message: expect.stringMatching(/at most 200,000 values/) }] });
  });

  it('evaluates a network cell on save, hands its results to a check below, and names the row of a bad node', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'N-110', title: 'Network' }).expect(201);
    const id = created.body.id;
    const elements = [
      { name: 'Grid', kind: 'supply', a: 'B', b: 'gnd', values: ['11 kV', '250 MVA', '20'] },
      { name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', values: ['80 uF'] },
      { name: 'Drive', kind: 'injection', a: 'gnd', b: 'B', values: ['[1, 5, 7]', '[100 A, 20 A, 14 A]'] },
    ];
    const net = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 1, position: 0, cell: { kind: 'network', frequency: '50 Hz', reference: 'gnd', analysis: 'harmonics', elements } })
      .expect(201);
    expect(net.body.changed[0].results).toMatchObject({ kind: 'network', status: 'ok', harmonics: { orders: [5, 7] } });
    expect(net.body.changed[0].results.values.THD_B.si).toBeGreaterThan(0);
    const check = await as(app, engineer, 'post', `/api/sheets/${id}/cells`)
      .send({ version: 2, position: 1, cell: { kind: 'check', condition: 'THD_B <= 5 %', basis: 'IEEE Std 519-2014, Table 1' } })
      .expect(201);
    expect(check.body.changed[0].results).toMatchObject({ kind: 'check', pass: true });
    const bad = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${net.body.changed[0].id}`)
      .send({
        version: 3,
        cell: {
          kind: 'network',
          frequency: '50 Hz',
          reference: 'gnd',
          analysis: 'harmonics',
          elements: [...elements.slice(0, 2), { ...elements[2], b: 'Bx' }],
        },
      })
      .expect(200);
    const results = savedResults(bad.body, net.body.changed[0].id)!;
    expect(results.errors[0]).toMatchObject({ line: 3, message: expect.stringMatching(/node Bx is joined only by row 3 \(Drive\)/) });
    // The check below no longer has THD_B, and says so rather than keep the old outcome.
    expect(savedResults(bad.body, check.body.changed[0].id)?.status).toBe('error');
    // A kind of element the format does not know is refused, naming the field.
    await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${net.body.changed[0].id}`)
      .send({ version: 4, cell: { kind: 'network', frequency: '50 Hz', reference: 'gnd', analysis: 'steady', elements: [{ ...elements[0], kind: 'diode' }] } })
      .expect(400)
      .expect((res) => expect(res.body).toMatchObject({ code: 'INVALID_CELL', details: [{ field: 'cell.elements.0.kind' }] }));
  });

  it('turns a CSV upload into a table cell, and stores nothing when a row is bad or the file is not text', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'C-107', title: 'Spectrum' }).expect(201);
    const id = created.body.id;
    const ok = await as(app, engineer, 'post', `/api/sheets/${id}/cells/import-csv`)
      .field('version', '1')
      .field('position', '0')
      .attach('file', Buffer.from('h, V_h [V]\n1, 230\n5, 9.2\n'), { filename: 'spectrum.csv', contentType: 'text/csv' })
      .expect(201);
    expect(ok.body.changed[0]).toMatchObject({
      kind: 'table',
      fields: {
        columns: [{ name: 'h' }, { name: 'V_h', unit: 'V' }],
        rows: [
          [1, 230],
          [5, 9.2],
        ],
      },
    });
    expect(ok.body.detected).toEqual({ delimiter: ',', decimalMark: '.', rows: 2, columns: 2 });
    // A spreadsheet's export with semicolons and decimal commas is read as such, and says so.
    const comma = await as(app, engineer, 'post', `/api/sheets/${id}/cells/import-csv`)
      .field('version', '2')
      .field('position', '1')
      .attach('file', Buffer.from('h;V_h [V]\r\n1;230\r\n5;9,2\r\n'), { filename: 'export.csv', contentType: 'text/csv' })
      .expect(201);
    expect(comma.body.changed[0].fields.rows).toEqual([
      [1, 230],
      [5, 9.2],
    ]);
    expect(comma.body.detected).toEqual({ delimiter: ';', decimalMark: ',', rows: 2, columns: 2 });
    const bad = await as(app, engineer, 'post', `/api/sheets/${id}/cells/import-csv`)
      .field('version', '3')
      .field('position', '1')
      .attach('file', Buffer.from('h, V_h [V]\n1, 230\n5, n/a\n'), { filename: 'bad.csv', contentType: 'text/csv' })
      .expect(400);
    expect(bad.body.details).toEqual([{ field: 'file', message: 'line 3: column V_h: "n/a" is not a number' }]);
    const binary = await as(app, engineer, 'post', `/api/sheets/${id}/cells/import-csv`)
      .field('version', '3')
      .field('position', '1')
      .attach('file', Buffer.from([0x25, 0x50, 0x44, 0x46, 0x00, 0xff, 0xfe]), { filename: 'lying.csv', contentType: 'text/csv' })
      .expect(415);
    expect(binary.body.message).toMatch(/not a CSV text file/);
    const sheet = await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200);
    expect(sheet.body.cells).toHaveLength(2);
    expect(sheet.body.version).toBe(3);
  });

  it('refuses a cell that is not in the format, naming the field', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`).send({ number: 'C-106', title: 'Bad' }).expect(201);
    const res = await as(app, engineer, 'post', `/api/sheets/${created.body.id}/cells`)
      .send({ version: 1, position: 0, cell: { kind: 'calc', source: 5 } })
      .expect(400);
    expect(res.body).toMatchObject({ code: 'INVALID_CELL', details: [{ field: 'cell.source' }] });
  });

  it('shows nothing of another firm: its projects and sheets are not found', async () => {
    const sheets = await as(app, engineer, 'get', `/api/projects/${projectId}/sheets`).expect(200);
    await as(app, outsider, 'get', `/api/projects/${projectId}`).expect(404);
    await as(app, outsider, 'get', `/api/sheets/${sheets.body[0].id}`).expect(404);
    await as(app, outsider, 'patch', `/api/sheets/${sheets.body[0].id}`).send({ version: 1, title: 'mine' }).expect(404);
    expect((await as(app, outsider, 'get', '/api/projects').expect(200)).body.map((p: { title: string }) => p.title)).not.toContain('Test project');
  });
});

describe('clients and their projects', () => {
  let app: INestApplication;
  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  it("gives an invited client exactly the projects named in the invitation, and nothing of the firm's work", async () => {
    const { waitForMail } = await import('./support/test-app');
    const { uniqueEmail, cookieFrom } = await import('./support/sessions');
    const owner = await makeCaller(app, ['owner', 'engineer']);
    const mine = await as(app, owner, 'post', '/api/projects')
      .send({ jobNumber: 'K-1', title: 'Client sees this', clientOrganisation: 'C', site: 'S' })
      .expect(201);
    await as(app, owner, 'post', '/api/projects').send({ jobNumber: 'K-2', title: 'Client does not see this', clientOrganisation: 'C', site: 'S' }).expect(201);
    const email = uniqueEmail('client');
    await as(app, owner, 'post', '/api/invitations')
      .send({ email, roles: ['engineer'], projectIds: [mine.body.id] })
      .expect(400);
    await as(app, owner, 'post', '/api/invitations')
      .send({ email, roles: ['client'], projectIds: [mine.body.id] })
      .expect(201);
    const token = /token=([\w-]+)/.exec((await waitForMail(email)).text)![1];
    const accepted = await as(app, undefined, 'post', '/api/invitations/accept')
      .send({ token, name: 'Cleo Client', password: 'a long client passphrase' })
      .expect(200);
    const cookie = cookieFrom(accepted);
    const request = (await import('supertest')).default;
    const list = await request(app.getHttpServer()).get('/api/projects').set('cookie', cookie).expect(200);
    expect(list.body.map((p: { title: string }) => p.title)).toEqual(['Client sees this']);
    await request(app.getHttpServer()).get(`/api/projects/${mine.body.id}`).set('cookie', cookie).expect(403);
    await request(app.getHttpServer()).get(`/api/projects/${mine.body.id}/sheets`).set('cookie', cookie).expect(403);
  });
});
