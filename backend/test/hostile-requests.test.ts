/**
 * Hostile requests against the real app process (dist/main.js, as `npm start` runs it): allocation
 * bombs, runaway and memory-hungry sheets, a CSV with a 24 MB header, an oversized multipart body on the
 * public verification route, a PKCS#12 file asking for 2^31−1 key iterations, LaTeX in strings, method
 * calls that mutate values, one firm flooding evaluation, and the crash class of the engine fuzzer.
 * Each is answered with a 4xx or a per-cell sentence within a few seconds, and afterwards the same
 * process (same pid) answers its health check and evaluates a sound sheet, its memory back down.
 */
import type { ChildProcess } from 'node:child_process';
import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import { hash } from 'bcrypt';
import fc from 'fast-check';
import forge from 'node-forge';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ALLOCATION_BOMBS, METHOD_CALLS } from '../../common/fuzz/hostile-expressions';
import { openDemoAccounts } from '../src/database/demo-accounts.check';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../src/database/seeders/demo.seeder';
import { makeSelfSignedP12 } from '../src/packages/signing';
import { User } from '../src/users/entities/user.entity';
import { ready, residentMb, startApp } from './support/app-process';
import { makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

const PORT = 3393;
const BASE = `http://127.0.0.1:${PORT}`;
const sheet = (cells: unknown[]) => ({ format: 'ampwright.sheet/1', title: 'Probe', cells });
const calc = (source: string) => sheet([{ kind: 'calc', source }]);
/** Under the size limit (316² < 100 000 elements), but some 20 matrix products: far past the deadline. */
const RUNAWAY = 'M = ones(316, 316)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M';
/** Each line under every limit; together far more than a sheet's memory (about 2 MB a line). */
const TIMEOUT_MS = 8000;
const MEMORY_HOG = Array.from({ length: 600 }, (_, k) => `a_${k} = ones(100000)`).join('\n');

/** A PKCS#12 file whose MAC asks for 2^31−1 iterations (RFC 7292 MacData.iterations), re-encoded as DER. */
function p12WithMacIterations(count: number): Buffer {
  const der = makeSelfSignedP12('Probe firm', 'probe-password');
  const pfx = forge.asn1.fromDer(der.toString('binary'));
  const macData = (pfx.value as forge.asn1.Asn1[])[2];
  const iterations = (macData.value as forge.asn1.Asn1[])[2];
  iterations.value = forge.util.hexToBytes(count.toString(16).padStart(8, '0'));
  return Buffer.from(forge.asn1.toDer(pfx).getBytes(), 'binary');
}

// This file's in-process app makes no packages. Set before the app module is imported, since its
// configuration is read then (vi.stubEnv in beforeAll would come too late).
const packageWorkerBefore = vi.hoisted(() => {
  const value = process.env.PACKAGE_WORKER;
  process.env.PACKAGE_WORKER = 'false';
  return value;
});

describe('hostile requests against the running app', () => {
  let app: INestApplication;
  let engineer: Caller;
  let owner: Caller;
  let neighbour: Caller;
  let child: ChildProcess;
  let pid: number;
  let baselineMb: number;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    owner = await makeCaller(app, ['owner'], engineer.firm);
    neighbour = await makeCaller(app, ['engineer']);
    // A long deadline, so that the memory hog below is stopped by its memory and not by a clock that
    // depends on the machine's speed; the runaway is still stopped by the deadline.
    child = startApp(PORT, { env: { EVALUATION_TIMEOUT_MS: String(TIMEOUT_MS) } });
    pid = child.pid!;
    await ready(BASE);
    // Warm: a sound sheet, so the baseline is of a working app.
    await post(engineer, '/evaluate', calc('x = 1'));
    baselineMb = residentMb(pid);
  }, 90_000);
  afterAll(async () => {
    child?.kill('SIGKILL');
    await app?.close();
    if (packageWorkerBefore === undefined) delete process.env.PACKAGE_WORKER;
    else process.env.PACKAGE_WORKER = packageWorkerBefore;
  });

  const headers = (who: Caller) => ({ cookie: who.cookie, 'x-ampwright-csrf': who.csrf });
  async function post(who: Caller, path: string, body: unknown): Promise<{ status: number; body: any; ms: number }> {
    const started = Date.now();
    const res = await fetch(`${BASE}/api${path}`, {
      method: 'POST',
      headers: { ...headers(who), 'content-type': 'application/json' },
      body: JSON.stringify(body),
    });
    return { status: res.status, body: await res.json(), ms: Date.now() - started };
  }
  async function upload(who: Caller | undefined, path: string, form: FormData): Promise<{ status: number; body: any; ms: number }> {
    const started = Date.now();
    const res = await fetch(`${BASE}/api${path}`, { method: 'POST', headers: who ? headers(who) : { 'x-ampwright-csrf': '1' }, body: form });
    return { status: res.status, body: await res.json(), ms: Date.now() - started };
  }
  const cellErrors = (body: any) => (body.cells as { errors: { message: string }[] }[]).flatMap((c) => c.errors.map((e) => e.message));

  async function stillServing(): Promise<void> {
    expect(child.exitCode).toBeNull();
    expect((await fetch(`${BASE}/api/health`)).status).toBe(200);
    const sound = await post(engineer, '/evaluate', calc('V = 230 V\nR = 46 ohm\nI = V / R'));
    expect(sound.status).toBe(200);
    expect(sound.body.cells[0].values.I.si).toBe(5);
  }

  it('answers allocation bombs with a sentence in the cell, before allocating', async () => {
    const probes = [
      'y = size(resize([1], [100000000]))',
      'y = resize(sparse([1]), [1, 100000000])',
      'y = ones(50000, 1) .* ones(1, 50000)',
      'y = size(1:1000000000)',
    ];
    for (const source of probes) {
      const res = await post(engineer, '/evaluate', calc(source));
      expect(res.status, source).toBe(200);
      expect(cellErrors(res.body).join(' '), source).toMatch(/larger than the limit|not part of the sheet language/);
      expect(res.ms).toBeLessThan(3000);
    }
    const doubling = ['a_0 = [1, 2, 3, 4]', ...Array.from({ length: 25 }, (_, k) => `a_${k + 1} = concat(a_${k}, a_${k})`)].join('\n');
    const res = await post(engineer, '/evaluate', calc(doubling));
    expect(cellErrors(res.body)[0]).toMatch(/larger than the limit of 100,000 elements/);
    await stillServing();
  }, 30_000);

  it('stops a sheet that needs too much memory or time in its own process, keeps the save, and tells every cell why', async () => {
    const hog = await post(engineer, '/evaluate', calc(MEMORY_HOG));
    expect(hog.status).toBe(422);
    expect(hog.body).toMatchObject({
      code: 'EVALUATION_TOO_LARGE',
      message: expect.stringMatching(/^This sheet needs more memory than a sheet may use \(256 MB\)/),
    });
    expect(hog.ms).toBeLessThan(TIMEOUT_MS);
    const runaway = await post(engineer, '/evaluate', calc(RUNAWAY));
    expect(runaway.status).toBe(422);
    expect(runaway.body.code).toBe('EVALUATION_TIMEOUT');

    // Saved into a sheet: the change is kept, and each cell carries the sentence instead of numbers.
    const project = (await post(engineer, '/projects', { jobNumber: 'H-1', title: 'Hostile', clientOrganisation: 'C', site: 'S' })).body;
    const created = (
      await post(engineer, `/projects/${project.id}/sheets`, {
        number: 'H-1',
        sheet: sheet([
          { kind: 'calc', source: 'x = 1' },
          { kind: 'note', text: 'below' },
        ]),
      })
    ).body;
    const saved = await fetch(`${BASE}/api/sheets/${created.id}/cells/${created.cells[0].id}`, {
      method: 'PATCH',
      headers: { ...headers(engineer), 'content-type': 'application/json' },
      body: JSON.stringify({ version: created.version, cell: { kind: 'calc', source: MEMORY_HOG } }),
    });
    expect(saved.status).toBe(200);
    const view = await (await fetch(`${BASE}/api/sheets/${created.id}`, { headers: headers(engineer) })).json();
    expect(view.cells[0].fields.source).toBe(MEMORY_HOG);
    for (const cell of view.cells) expect(cell.results.errors[0].message).toMatch(/needs more memory than a sheet may use/);
    await stillServing();
  }, 60_000);

  it('refuses method calls that would mutate a value, and keeps LaTeX from strings inert', async () => {
    const res = await post(
      engineer,
      '/evaluate',
      sheet([
        { kind: 'calc', source: 'a = [1, 2, 3]\nn = size(a.resize([1]))' },
        { kind: 'calc', source: 's = sum(a)' },
      ]),
    );
    expect(cellErrors(res.body)[0]).toMatch(/calling a method on a value/);
    expect(res.body.cells[1].values.s.si).toBe(6);
    const tex = await post(engineer, '/evaluate', calc('x = "\\\\href{https://evil.example/login}{see datasheet}"\ny = "\\\\rule{5000em}{5000em}"'));
    const lines = tex.body.cells[0].lines as { tex: { formula: string; working: string; result: string } }[];
    for (const line of lines) for (const t of Object.values(line.tex)) expect(t).not.toMatch(/\\href|\\rule/);
  });

  it('refuses a CSV with a 24 MB header of 12 million columns at once', async () => {
    const project = (await post(engineer, '/projects', { jobNumber: 'H-2', title: 'CSV', clientOrganisation: 'C', site: 'S' })).body;
    const created = (await post(engineer, `/projects/${project.id}/sheets`, { number: 'H-2', sheet: sheet([]) })).body;
    const form = new FormData();
    form.set('version', String(created.version));
    form.set('position', '0');
    form.set('file', new Blob([`${'a,'.repeat(12_000_000)}b\n1\n`]), 'wide.csv');
    const res = await upload(engineer, `/sheets/${created.id}/cells/import-csv`, form);
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/line 1: is 24,000,001 characters long; a line may hold at most 65,536/);
    expect(res.ms).toBeLessThan(5000);
    await stillServing();
  }, 30_000);

  it('takes exactly one file on the public verification route, and bounds every multipart upload', async () => {
    const fields = new FormData();
    for (let k = 0; k < 120; k++) fields.append(`f${k}`, 'x'.repeat(1024 * 1024));
    const flooded = await upload(undefined, '/verify', fields);
    expect(flooded.status).toBe(400);
    expect(flooded.body.message).toMatch(/more (fields|parts) than this upload takes/);
    const two = new FormData();
    two.append('file', new Blob(['%PDF-1.7 a']), 'a.pdf');
    two.append('file', new Blob(['%PDF-1.7 b']), 'b.pdf');
    expect((await upload(undefined, '/verify', two)).status).toBe(400);
    const extra = new FormData();
    extra.append('note', 'hello');
    extra.append('file', new Blob(['%PDF-1.7 a']), 'a.pdf');
    expect((await upload(undefined, '/verify', extra)).status).toBe(400);
    // A signed-in upload takes a few short fields beside its file, and no more.
    const long = new FormData();
    long.set('password', 'x'.repeat(4096));
    long.set('file', new Blob([Buffer.from('30', 'hex')]), 'firm.p12');
    const tooLong = await upload(owner, '/firm/certificate', long);
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.message).toMatch(/longer than this upload takes/);
    await stillServing();
  }, 30_000);

  it('refuses a PKCS#12 file asking for 2^31−1 iterations before decrypting anything', async () => {
    const form = new FormData();
    form.set('password', 'probe-password');
    form.set('file', new Blob([p12WithMacIterations(2 ** 31 - 1)]), 'firm.p12');
    const res = await upload(owner, '/firm/certificate', form);
    expect(res.status).toBe(400);
    expect(res.body.message).toMatch(/asks for 2,147,483,647 key iterations; Ampwright takes at most 100,000/);
    expect(res.ms).toBeLessThan(3000);
    await stillServing();
  }, 30_000);

  it('keeps one firm flooding evaluation from holding up another firm', async () => {
    const flood = Promise.all(Array.from({ length: 24 }, () => post(neighbour, '/evaluate', calc(RUNAWAY))));
    await new Promise((r) => setTimeout(r, 300));
    const quiet: number[] = [];
    for (let k = 0; k < 5; k++) {
      const res = await post(engineer, '/evaluate', calc(`x = ${k} V / 2 ohm`));
      expect(res.status).toBe(200);
      quiet.push(res.ms);
    }
    const answers = await flood;
    const busy = answers.filter((a) => a.status === 429);
    expect(busy.length).toBeGreaterThan(0);
    expect(busy[0].body).toMatchObject({ code: 'EVALUATION_BUSY', message: expect.stringMatching(/^The evaluator is busy with this firm's other work/) });
    expect(answers.every((a) => a.status === 429 || a.status === 422)).toBe(true);
    expect(Math.max(...quiet)).toBeLessThan(1500);
    await stillServing();
  }, 60_000);

  it('answers the crash class of the engine fuzzer through the API (fixed seed)', async () => {
    const sources = fc.sample(fc.oneof(ALLOCATION_BOMBS, METHOD_CALLS), { numRuns: 40, seed: 20261202 });
    for (const source of sources) {
      const res = await post(engineer, '/evaluate', calc(`x = 2 V\ny = ${source}`));
      expect([200, 422], source).toContain(res.status);
      if (res.status === 200) expect(res.body.cells[0].lines.length, source).toBe(2);
      else expect(res.body.message).toMatch(/^This sheet /);
      expect(res.ms, source).toBeLessThan(6000);
    }
    await stillServing();
  }, 120_000);

  it('is the same process throughout, with its memory back down', async () => {
    expect(child.pid).toBe(pid);
    await stillServing();
    // The work ran in evaluation processes: the server's own memory is about where it started.
    expect(residentMb(pid)).toBeLessThan(baselineMb + 150);
  });

  it('finds demo accounts that still open with the published password (a production instance refuses to start)', async () => {
    const em = app.get(EntityManager).fork();
    const email = DEMO_PEOPLE[1].email;
    const existing = await em.findOne(User, { email });
    const demo = existing ?? em.create(User, { email, name: 'Demo', passwordHash: '' });
    const original = existing?.passwordHash;
    demo.passwordHash = await hash(DEMO_PASSWORD, 4);
    await em.flush();
    try {
      expect(await openDemoAccounts(em)).toContain(email);
      demo.passwordHash = await hash('a password of its own', 4);
      await em.flush();
      expect(await openDemoAccounts(em)).not.toContain(email);
    } finally {
      if (original) demo.passwordHash = original;
      else em.remove(demo);
      await em.flush();
    }
  });

  it('refuses to start in production with the local demo settings, naming what to set', async () => {
    const prod = startApp(PORT + 1, { env: { NODE_ENV: 'production', APP_HOST: '0.0.0.0', APP_URL: 'https://calc.example.com' }, output: 'pipe' });
    let err = '';
    prod.stderr?.on('data', (c: Buffer) => (err += c.toString()));
    const code = await new Promise<number | null>((r) => prod.on('exit', r));
    expect(code).not.toBe(0);
    expect(err).toMatch(/Ampwright will not start in production with local-only settings/);
    expect(err).toMatch(/CERTIFICATE_SECRET/);
    expect(err).toMatch(/COOKIE_SECURE/);
  }, 30_000);
});
