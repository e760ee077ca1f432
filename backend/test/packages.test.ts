import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ProjectPerson } from '../src/projects/entities/project.entity';
import { makeSelfSignedP12 } from '../src/packages/signing';
import { evaluateSheet } from '@ampwright/common';
import { buildPackageInWorker } from '../src/packages/build-in-worker';
import { as, binary, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

const toFile = (pdf: Buffer) => {
  const file = join(mkdtempSync(join(tmpdir(), 'aw-pdf-')), 'package.pdf');
  writeFileSync(file, pdf);
  return file;
};

/** poppler's pdfsig on a file: its report and exit status (Debian poppler-utils). */
function pdfsig(pdf: Buffer): { out: string; status: number | null } {
  const file = toFile(pdf);
  const r = spawnSync('pdfsig', [file], { encoding: 'utf8' });
  return { out: `${r.stdout}${r.stderr}`, status: r.status };
}

describe('signed packages, the client portal and verification', () => {
  let app: INestApplication;
  let owner: Caller;
  let engineer: Caller;
  let checker: Caller;
  let approver: Caller;
  let client: Caller;
  let otherClient: Caller;
  let revisionId: string;
  let issueRequestId: string;
  let pdf: Buffer;

  beforeAll(async () => {
    app = await createTestApp();
    owner = await makeCaller(app, ['owner']);
    engineer = await makeCaller(app, ['engineer'], owner.firm);
    checker = await makeCaller(app, ['checker'], owner.firm);
    approver = await makeCaller(app, ['approver'], owner.firm);
    client = await makeCaller(app, ['client'], owner.firm);
    otherClient = await makeCaller(app, ['client'], owner.firm);
    const project = (
      await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'P-1', title: 'Packages', clientOrganisation: 'Client', site: 'Site' }).expect(201)
    ).body;
    const other = (
      await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'P-2', title: 'Other', clientOrganisation: 'Other client', site: 'Site' }).expect(201)
    ).body;
    const em = app.get(EntityManager).fork();
    em.persist([
      new ProjectPerson(em.getReference('Project', project.id) as never, em.getReference('User', client.user.id) as never, 'client'),
      new ProjectPerson(em.getReference('Project', other.id) as never, em.getReference('User', otherClient.user.id) as never, 'client'),
    ]);
    await em.flush();
    const sheet = (
      await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`).send({ number: 'C-1', templateId: 'series-rlc-steady-state' }).expect(201)
    ).body;
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/attachments`).attach('file', Buffer.from('site reading 1\n'), 'site.txt').expect(201);
    // A draft on the other project that must never reach anyone outside the firm.
    await as(app, engineer, 'post', `/api/projects/${other.id}/sheets`).send({ number: 'C-9', title: 'Draft only' }).expect(201);
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    const issued = await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200);
    revisionId = issued.body.id;
    issueRequestId = issued.headers['x-request-id'] as string;
  });
  afterAll(async () => {
    await app?.close();
  });

  it('makes the package off the request path, with its progress, and keeps its SHA-256 on the revision', async () => {
    const deadline = Date.now() + 60_000;
    let status = (await as(app, approver, 'get', `/api/revisions/${revisionId}/package/status`).expect(200)).body;
    expect(['queued', 'running', 'done']).toContain(status.status);
    while (status.status !== 'done' && Date.now() < deadline) {
      expect(status.status).not.toBe('failed');
      await new Promise((r) => setTimeout(r, 300));
      status = (await as(app, approver, 'get', `/api/revisions/${revisionId}/package/status`)).body;
    }
    expect(status).toMatchObject({ status: 'done', percent: 100, error: null });
    const res = await binary(as(app, approver, 'get', `/api/revisions/${revisionId}/package`)).expect(200);
    pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(createHash('sha256').update(pdf).digest('hex')).toBe(status.pdfSha256);
    const revision = (await as(app, engineer, 'get', `/api/revisions/${revisionId}`)).body;
    expect(revision.pdfSha256).toBe(status.pdfSha256);
  }, 90_000);

  it("keeps the id of the request that issued the revision on its package job, for the job's log lines", async () => {
    expect(issueRequestId).toMatch(/^[0-9a-f-]{36}$/);
    const [job] = await app
      .get(EntityManager)
      .fork()
      .getConnection()
      .execute<{ request_id: string | null }[]>('select j.request_id from package_job j where j.revision_id = ?', [revisionId]);
    expect(job.request_id).toBe(issueRequestId);
  });

  it('lays out the same document from the same snapshot every time (only the signature differs)', async () => {
    const revision = (await as(app, engineer, 'get', `/api/revisions/${revisionId}`)).body;
    const input = {
      revisionId,
      snapshot: revision.snapshot,
      history: [revision],
      attachments: [{ ...revision.snapshot.attachments[0], body: Buffer.from('site reading 1\n') }],
    };
    const [a, b] = await Promise.all([buildPackageInWorker(input), buildPackageInWorker(input)]);
    expect(a.length).toBeGreaterThan(10_000);
    expect(Buffer.compare(a, b)).toBe(0);
  }, 60_000);

  it('carries no link an author wrote through LaTeX in a string', async () => {
    const revision = (await as(app, engineer, 'get', `/api/revisions/${revisionId}`)).body;
    const hostile = {
      format: 'ampwright.sheet/1' as const,
      title: 'Links',
      cells: [{ kind: 'calc' as const, source: 'x = "\\href{https://evil.example/login}{see datasheet}"\ny = "\\rule{5000em}{5000em}"' }],
    };
    const snapshot = { ...revision.snapshot, sheet: hostile, cellIds: ['c-1'], results: evaluateSheet(hostile).cells, queries: [], attachments: [] };
    const made = await buildPackageInWorker({ revisionId, snapshot, history: [revision], attachments: [] });
    const raw = made.toString('latin1');
    expect(raw).not.toMatch(/\/URI|\/Subtype\s*\/Link|evil\.example/);
  }, 60_000);

  it('is signed: pdfsig (poppler) calls the signature valid and the document unmodified', () => {
    const { out } = pdfsig(pdf);
    expect(out).toMatch(/Signature Validation: Signature is Valid\./);
    expect(out).toMatch(/Total document signed/);
    expect(out).toMatch(/adbe\.pkcs7\.detached/);
  });

  it('renders as real pages: the text of the cover, the cells, the caution and the page numbers', () => {
    const file = toFile(pdf);
    const text = execFileSync('pdftotext', ['-layout', file, '-']).toString();
    for (const words of ['Calculation package', 'Job number', 'P-1', 'Revision', 'Checked by', 'qualified engineers', 'Attachments', 'site.txt'])
      expect(text).toContain(words);
    // The firm's internal query register stays out unless the firm chose to include it.
    expect(text).not.toContain('Appendix: query register');
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file]).toString())![1]);
    expect(pages).toBeGreaterThan(3);
    expect(text).toContain(`Page ${pages} of ${pages}`);
    // The attachment is embedded in the file.
    expect(execFileSync('pdfdetach', ['-list', file]).toString()).toContain('site.txt');
  });

  it('draws the maths of a note as maths in the signed package: none of its TeX in the text, and ink between the words around it (pdftotext -bbox, pdftoppm)', () => {
    const file = toFile(pdf);
    const text = execFileSync('pdftotext', ['-layout', file, '-']).toString();
    // The template's note: "The amplitude of the current is $I_0 = \frac{E_0}{Z}$ where $Z = \sqrt{…}$".
    expect(text).toContain('The amplitude of the current is');
    expect(text).not.toMatch(/\\frac|fracE|\\sqrt|sqrtR|E_0|\$I/);
    // Find the words either side of the first formula, on the page and line where they stand.
    const boxes = execFileSync('pdftotext', ['-bbox', file, '-']).toString();
    const pages = boxes.split('<page ').slice(1);
    const pageIndex = pages.findIndex((p) => /<word[^>]*>amplitude<\/word>/.test(p) && />where</.test(p));
    expect(pageIndex).toBeGreaterThanOrEqual(0);
    const words = [...pages[pageIndex].matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)].map((m) => ({
      x0: +m[1],
      y0: +m[2],
      x1: +m[3],
      y1: +m[4],
      w: m[5],
    }));
    const k = words.findIndex((w, i) => w.w === 'is' && words[i - 1]?.w === 'current');
    const before = words[k];
    const after = words.slice(k + 1).find((w) => w.w === 'where')!;
    expect(Math.abs(after.y0 - before.y0)).toBeLessThan(4); // the formula sits on the line, between them
    expect(after.x0 - before.x1).toBeGreaterThan(25);
    // A picture of that page at 144 dpi (2 pixels a point): the gap between the words holds ink.
    const dir = mkdtempSync(join(tmpdir(), 'aw-page-'));
    execFileSync('pdftoppm', ['-r', '144', '-gray', '-f', String(pageIndex + 1), '-l', String(pageIndex + 1), file, join(dir, 'p')]);
    const pgm = readFileSync(
      join(
        dir,
        readdirSync(dir).find((f) => f.endsWith('.pgm'))!,
      ),
    );
    const header = /^P5\s+(\d+)\s+(\d+)\s+255\s/.exec(pgm.subarray(0, 40).toString('latin1'))!;
    const width = Number(header[1]);
    const pixels = pgm.subarray(header[0].length);
    let ink = 0;
    for (let y = Math.floor((before.y0 - 6) * 2); y < Math.ceil((before.y1 + 6) * 2); y++) {
      for (let x = Math.ceil(before.x1 * 2) + 4; x < Math.floor(after.x0 * 2) - 4; x++) if (pixels[y * width + x] < 128) ink++;
    }
    expect(ink).toBeGreaterThan(150);
  });

  it('calls a package with one byte changed altered, in pdfsig and on the verification page', async () => {
    const ok = await as(app, undefined, 'post', '/api/verify').attach('file', pdf, 'package.pdf').expect(200);
    expect(ok.body).toMatchObject({ verdict: 'unaltered', jobNumber: 'P-1', sheet: 'C-1', revision: 'A', firm: owner.firm.name });
    const altered = Buffer.from(pdf);
    // A byte inside the signed content (a page's drawing), not the signature itself.
    const at = altered.indexOf('Calculation package') >= 0 ? altered.indexOf('stream') + 20 : 2000;
    altered[at] = altered[at] ^ 0x01;
    expect(pdfsig(altered).out).not.toMatch(/Signature is Valid\./);
    const res = await as(app, undefined, 'post', '/api/verify').attach('file', altered, 'package.pdf').expect(200);
    expect(res.body.verdict).toBe('altered');
  });

  it('answers a file that is not a PDF, an empty one, and a PDF that is not ours, without saying anything of unissued work', async () => {
    const notPdf = await as(app, undefined, 'post', '/api/verify').attach('file', Buffer.from('hello'), 'x.pdf').expect(415);
    expect(notPdf.body.message).toMatch(/not a PDF/);
    await as(app, undefined, 'post', '/api/verify').attach('file', Buffer.alloc(0), 'x.pdf').expect(400);
    const foreign = await as(app, undefined, 'post', '/api/verify')
      .attach('file', Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n'), 'x.pdf')
      .expect(200);
    expect(foreign.body).toEqual({ verdict: 'unknown', message: 'This PDF is not a package issued by this service.' });
    const big = await as(app, undefined, 'post', '/api/verify')
      .attach('file', Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(25 * 1024 * 1024)]), 'big.pdf')
      .expect(413);
    expect(big.body.message).toMatch(/25 MB/);
  });

  it('includes the query register in packages issued after the owner turns it on', async () => {
    expect((await as(app, owner, 'get', '/api/firm/package-settings').expect(200)).body).toEqual({ queryRegister: false });
    await as(app, engineer, 'put', '/api/firm/package-settings').send({ queryRegister: true }).expect(403);
    expect((await as(app, owner, 'put', '/api/firm/package-settings').send({ queryRegister: 'yes' }).expect(400)).body.message).toMatch(
      /queryRegister must be true or false/,
    );
    expect((await as(app, owner, 'put', '/api/firm/package-settings').send({ queryRegister: true }).expect(200)).body).toEqual({ queryRegister: true });
    try {
      const project = (
        await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'P-3', title: 'Register', clientOrganisation: 'Client', site: 'Site' }).expect(201)
      ).body;
      const sheet = (
        await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`)
          .send({ number: 'C-2', sheet: { format: 'ampwright.sheet/1', title: 'Register', cells: [{ kind: 'calc', source: 'x = 1' }] } })
          .expect(201)
      ).body;
      await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
      await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
      await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
      const issued = (await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200)).body;
      const revision = (await as(app, engineer, 'get', `/api/revisions/${issued.id}`).expect(200)).body;
      expect(revision.snapshot.packageOptions).toEqual({ queryRegister: true });
      const made = await buildPackageInWorker({ revisionId: issued.id, snapshot: revision.snapshot, history: [revision], attachments: [] });
      expect(execFileSync('pdftotext', ['-layout', toFile(made), '-']).toString()).toContain('Appendix: query register');
    } finally {
      await as(app, owner, 'put', '/api/firm/package-settings').send({ queryRegister: false }).expect(200);
    }
  }, 60_000);

  it("tells a client nothing of the firm's internal work: no counts on projects, no error text on a package", async () => {
    const projects = (await as(app, client, 'get', '/api/projects').expect(200)).body;
    expect(projects).toHaveLength(1);
    expect(projects[0]).not.toHaveProperty('sheetCount');
    expect(projects[0]).not.toHaveProperty('openQueries');
    expect((await as(app, engineer, 'get', '/api/projects').expect(200)).body[0]).toHaveProperty('openQueries');
    const em = app.get(EntityManager).fork();
    const [job] = await em
      .getConnection()
      .execute<{ id: string; status: string; error: string | null }[]>('select id, status, error from package_job where revision_id = ?', [revisionId]);
    await em.getConnection().execute("update package_job set error = 'ECONNREFUSED 10.0.0.7:9000 (internal store)' where id = ?", [job.id]);
    try {
      expect((await as(app, client, 'get', `/api/revisions/${revisionId}/package/status`).expect(200)).body.error).toBe(
        'The package could not be made yet; the issuing firm has been told.',
      );
      expect((await as(app, approver, 'get', `/api/revisions/${revisionId}/package/status`).expect(200)).body.error).toMatch(/ECONNREFUSED/);
    } finally {
      await em.getConnection().execute('update package_job set error = ? where id = ?', [job.error, job.id]);
    }
  });

  it('shows a client exactly the issued revisions of their projects, and nothing else', async () => {
    const mine = (await as(app, client, 'get', '/api/portal/revisions').expect(200)).body;
    expect(mine.map((r: { jobNumber: string; code: string }) => `${r.jobNumber} ${r.code}`)).toEqual(['P-1 A']);
    await binary(as(app, client, 'get', `/api/revisions/${revisionId}/package`)).expect(200);
    expect((await as(app, otherClient, 'get', '/api/portal/revisions').expect(200)).body).toEqual([]);
    await as(app, otherClient, 'get', `/api/revisions/${revisionId}/package`).expect(404);
    // A client reaches no draft, no query, no sheet.
    await as(app, client, 'get', `/api/revisions/${revisionId}`).expect(403);
    const sheets = await as(app, client, 'get', '/api/projects').expect(200);
    for (const p of sheets.body as { id: string }[]) await as(app, client, 'get', `/api/projects/${p.id}/sheets`).expect(403);
  });

  it("takes the owner's PKCS#12 certificate, and refuses a wrong password or an expired certificate with the reason", async () => {
    const p12 = makeSelfSignedP12('Upload Test Firm', 'right-password');
    const wrong = await as(app, owner, 'post', '/api/firm/certificate').field('password', 'wrong-password').attach('file', p12, 'firm.p12').expect(400);
    expect(wrong.body.message).toBe('The certificate was refused: The password does not open this certificate file.');
    const expired = makeSelfSignedP12('Old Firm', 'pw', 1, new Date(Date.now() - 3 * 365 * 86400_000));
    const old = await as(app, owner, 'post', '/api/firm/certificate').field('password', 'pw').attach('file', expired, 'old.p12').expect(400);
    expect(old.body.message).toMatch(/The certificate expired on \d{4}-\d{2}-\d{2}\./);
    const junk = await as(app, owner, 'post', '/api/firm/certificate')
      .field('password', 'x')
      .attach('file', Buffer.from('not a certificate'), 'x.p12')
      .expect(400);
    expect(junk.body.message).toMatch(/not a PKCS#12/);
    const ok = await as(app, owner, 'post', '/api/firm/certificate').field('password', 'right-password').attach('file', p12, 'firm.p12').expect(201);
    expect(ok.body).toMatchObject({ subject: expect.stringContaining('Upload Test Firm'), selfSigned: false });
    expect((await as(app, owner, 'get', '/api/firm/certificate').expect(200)).body.fingerprint).toBe(ok.body.fingerprint);
    // The password is sealed at rest, never stored as given.
    const rows = await app
      .get(EntityManager)
      .getConnection()
      .execute<{ password_sealed: string }[]>('select password_sealed from firm_certificate where fingerprint = ?', [ok.body.fingerprint]);
    expect(rows[0].password_sealed).not.toContain('right-password');
  });
});
