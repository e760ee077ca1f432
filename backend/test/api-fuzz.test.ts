/**
 * Fuzzing the API. Every route that takes a body gets generated hostile bodies (fast-check, fixed
 * seed): wrong types, huge and odd values, deep nesting, prototype-pollution keys, and valid bodies
 * with one field spoiled. Every route gets hostile query strings, the API and the static files get
 * path tricks, the JSON routes get wrong content types, and the upload routes get files whose names
 * lie about their content. Whatever comes, the answer is never a 5xx: it is a 4xx with an error code
 * and a sentence (no stack trace), or a success; a spoiled required field is always refused; and
 * nothing sent leaks into the server's objects.
 */
import type { INestApplication } from '@nestjs/common';
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildFirm, PNG } from './support/firm';
import { fillIds, MATRIX, validBodies, type ResourceIds } from './support/routes';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

const SEED = 20261202;
const PER_ROUTE = Number(process.env.API_FUZZ_PER_ROUTE ?? 12);
const ELF = Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(56)]);
const PDF = Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n');
// A ZIP's local file header signature, PK\x03\x04 (PKWARE APPNOTE.TXT 4.3.7), with an empty entry.
const ZIP = Buffer.from('504b0304140000000000000000000000000000000000000000000000000000000000504b0506000000000000000000000000000000000000', 'hex');

/** Hostile values for one field. */
const hostileValue = fc.oneof(
  fc.constantFrom(
    null,
    true,
    false,
    0,
    -1,
    1e308,
    -1e308,
    2 ** 53 + 1,
    0.5,
    '',
    ' ',
    'x'.repeat(100_000),
    '\u0000',
    '\u202e',
    '🙂',
    '../../etc/passwd',
    '<script>alert(1)</script>',
    "' OR 1=1 --",
    '${7*7}',
    '00000000-0000-4000-8000-000000000000',
    [],
    {},
    [[[[[]]]]],
  ),
  fc.jsonValue({ maxDepth: 3 }),
  fc.string({ unit: 'binary', maxLength: 50 }),
);

/** A body as JSON text: anything at all, a valid body with one field spoiled, or a pollution attempt. */
function hostileBodies(valid: Record<string, unknown> | undefined): fc.Arbitrary<{ text: string }> {
  const anything = fc.jsonValue({ maxDepth: 4 }).map((v) => ({ text: JSON.stringify(v) }));
  const pollution = fc
    .constantFrom(
      '{"__proto__": {"polluted": "yes"}}',
      '{"constructor": {"prototype": {"polluted": "yes"}}}',
      '{"__proto__": {"isAdmin": true}, "roles": ["owner"]}',
    )
    .map((text) => ({ text }));
  const deep = fc.integer({ min: 1000, max: 20_000 }).map((n) => ({ text: `${'{"a":'.repeat(n)}1${'}'.repeat(n)}` }));
  const keys = Object.keys(valid ?? {});
  if (!keys.length) return fc.oneof(anything, pollution, deep);
  const spoiled = fc.tuple(fc.constantFrom(...keys), hostileValue).map(([key, value]) => ({ text: JSON.stringify({ ...valid, [key]: value }) }));
  return fc.oneof({ weight: 3, arbitrary: spoiled }, { weight: 1, arbitrary: anything }, { weight: 1, arbitrary: pollution }, { weight: 1, arbitrary: deep });
}

/** The answer is a success, or a clear refusal: never a 5xx, never a stack trace. */
function expectClearAnswer(res: request.Response, what: string): void {
  expect(res.status, `${what}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(500);
  if (res.status >= 400 && res.type === 'application/json') {
    expect(typeof res.body.code, what).toBe('string');
    expect(String(res.body.message).length, what).toBeGreaterThan(3);
    expect(JSON.stringify(res.body), what).not.toMatch(/\n\s+at |\.[jt]s:\d+|node_modules|TypeError|ReferenceError|SqlError|ER_[A-Z_]+/);
  }
}

describe('fuzzing the API', () => {
  let app: INestApplication;
  let me: Caller;
  let checker: Caller;
  let ids: ResourceIds;
  let bodies: Record<string, object>;

  beforeAll(async () => {
    app = await createTestApp();
    const firm = await buildFirm(app, 'Fuzz');
    ids = firm.ids;
    me = firm.engineer;
    checker = firm.checker;
    bodies = validBodies(ids, firm.checker.user.id);
  }, 60_000);
  afterAll(async () => {
    await app?.close();
  });

  // Signing out would end the session the other cases use; it takes no body anyway.
  const withBodies = Object.keys(MATRIX).filter((r) => /^(POST|PUT|PATCH) /.test(r) && r !== 'POST /api/auth/logout');

  it.each(withBodies)(
    `%s: ${PER_ROUTE} hostile bodies, each answered clearly`,
    async (route) => {
      const [method, path] = route.split(' ');
      const cases = fc.sample(hostileBodies(bodies[route] as Record<string, unknown> | undefined), { numRuns: PER_ROUTE, seed: SEED });
      for (const { text } of cases) {
        const res = await as(app, me, method.toLowerCase() as 'post', fillIds(path, ids))
          .set('content-type', 'application/json')
          .send(text);
        expectClearAnswer(res, `${route} with ${text.slice(0, 120)}`);
      }
      // Nothing sent reached the server's objects.
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      expect(({} as Record<string, unknown>).isAdmin).toBeUndefined();
    },
    120_000,
  );

  // A spoiled required field is refused (the value is the wrong type, out of range, or not an id);
  // CELL stands for the id of a cell of the sheet.
  const spoiledRefused = [
    ['PATCH /api/sheets/:id/cells/:cellId', { version: 'one', cell: { kind: 'calc', source: 'x = 1' } }],
    ['PATCH /api/sheets/:id/cells/:cellId', { version: 1, cell: { kind: 'calc', source: 42 } }],
    ['PATCH /api/sheets/:id/cells/:cellId', { version: 1, cell: { kind: 'spreadsheet' } }],
    ['PATCH /api/sheets/:id/cells/:cellId', { version: 1.5, cell: { kind: 'calc', source: 'x = 1' } }],
    ['POST /api/sheets/:id/cells', { version: 1, position: -1, cell: { kind: 'calc', source: 'x = 1' } }],
    ['POST /api/sheets/:id/cells/:cellId/move', { version: 1, position: 'top' }],
    ['POST /api/sheets/:id/queries', { cellId: '../etc', text: 'x' }],
    ['POST /api/sheets/:id/queries', { cellId: 'CELL', text: 'x'.repeat(5000) }],
    ['POST /api/projects', { jobNumber: '', title: 'x', clientOrganisation: 'y', site: 'z' }],
    ['POST /api/projects', { jobNumber: ['F-1'], title: 'x', clientOrganisation: 'y', site: 'z' }],
    ['PATCH /api/members/:id', { roles: ['superuser'] }],
    ['PATCH /api/members/:id', { roles: 'owner' }],
    ['POST /api/invitations', { email: 'not an address', roles: ['engineer'] }],
    ['PUT /api/projects/:id/members', { userIds: ['not-a-uuid'] }],
    [
      'POST /api/evaluate',
      { format: 'ampwright.sheet/1', title: 'x', cells: [{ kind: 'calc', source: 'x = 1' }], extra: { deep: 1 }, settings: { significantDigits: 99 } },
    ],
  ] as const;

  it.each(spoiledRefused.map(([route, body]) => [route, JSON.stringify(body).slice(0, 80), body] as const))(
    '%s refuses %s with 400 naming the problem',
    async (route, _label, body) => {
      const [method, path] = route.split(' ');
      const fixed = JSON.parse(JSON.stringify(body).replace('"CELL"', `"${ids.cell}"`));
      const who = path.includes('/queries') ? checker : me;
      const res = await as(app, who, method.toLowerCase() as 'post', fillIds(path, ids)).send(fixed);
      expect(res.status, `${route}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.message.length).toBeGreaterThan(10);
    },
  );

  const HOSTILE_QUERIES = [
    '?version=abc',
    '?version=1&version=2',
    '?version[]=1',
    '?version=1e400',
    '?from=../etc&to=draft',
    '?from[$ne]=x',
    '?to=%00',
    '?all=banana',
    '?all[]=true',
    '?token[$gt]=',
    `?token=${'x'.repeat(10_000)}`,
    '?__proto__[polluted]=yes',
    '?constructor[prototype][polluted]=yes',
    '?%ff=%fe',
  ];
  const gets = Object.keys(MATRIX).filter((r) => r.startsWith('GET ') || r.startsWith('DELETE '));

  it.each(gets)('%s: hostile query strings answered clearly', async (route) => {
    const [method, path] = route.split(' ');
    for (const q of HOSTILE_QUERIES) {
      // Of the deletions only a cell's reads a query (its version); it is tried with versions that are
      // not numbers, so nothing is deleted.
      if (method === 'DELETE' && (!path.includes(':cellId') || !/version=(abc|1&|\[|1e400)/.test(q))) continue;
      const res = await as(app, me, method.toLowerCase() as 'get', fillIds(path, ids) + q);
      expectClearAnswer(res, `${route}${q.slice(0, 60)}`);
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('validates the query of every route that reads one', async () => {
    const sheet = `/api/sheets/${ids.sheet}`;
    for (const url of [
      `${sheet}/cells/${ids.cell}?version=abc`,
      `${sheet}/cells/${ids.cell}?version=1e400`,
      `${sheet}/cells/${ids.cell}`,
      `${sheet}/queries?all=banana`,
      `/api/sheets/${ids.issuedSheet}/diff?from=../etc&to=draft`,
      `/api/sheets/${ids.issuedSheet}/diff?from=${ids.revision}&to=nowhere`,
    ]) {
      const method = url.includes('/cells/') ? 'delete' : 'get';
      const res = await as(app, me, method, url);
      expect(res.status, `${method} ${url}: ${JSON.stringify(res.body)}`).toBe(400);
    }
    const preview = await request(app.getHttpServer()).get('/api/invitations/preview?token[$gt]=');
    expect(preview.status).toBeGreaterThanOrEqual(400);
    expect(preview.status).toBeLessThan(500);
  });

  it('answers path tricks with 400 or 404, and never a file from outside the app', async () => {
    const tricks = [
      '/api/sheets/..%2F..%2F..%2Fetc%2Fpasswd',
      '/api/sheets/%2e%2e%2f%2e%2e%2fetc%2fpasswd',
      '/api/sheets/00000000-0000-4000-8000-000000000000%00',
      "/api/sheets/'%20OR%201=1%20--",
      `/api/attachments/${ids.attachment}%2F..%2F..%2Fdownload`,
      '/api/attachments/../../../etc/passwd/download',
      '/api/..%2f..%2fpackage.json',
      '/api/%2e%2e/%2e%2e/.env',
      '/..%2f..%2f..%2fetc%2fpasswd',
      '/assets/..%2f..%2f..%2fpackage.json',
      '/%252e%252e/%252e%252e/package.json',
      '/api/sheets/%ff%fe',
      `/api/${'a'.repeat(8000)}`,
      '/api/sheets/' + '%2e'.repeat(3000),
    ];
    for (const path of tricks) {
      const res = await as(app, me, 'get', path);
      expect([400, 404, 414, 431], `${path.slice(0, 80)}: ${res.status}`).toContain(res.status);
      expect(res.text, path.slice(0, 80)).not.toMatch(/root:x:0:0|"workspaces"|DB_PASSWORD|BEGIN (RSA |EC )?PRIVATE KEY/);
    }
  });

  it("refuses a JSON route's body in any other content type with 415, and malformed JSON with 400", async () => {
    const route = 'PATCH /api/sheets/:id/cells/:cellId';
    const url = fillIds(route.split(' ')[1], ids);
    const body = JSON.stringify(bodies[route]);
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'application/xml', 'text/html', 'application/octet-stream']) {
      const res = await as(app, me, 'patch', url).set('content-type', type).send(body);
      expect(res.status, type).toBe(415);
      expect(res.body).toMatchObject({ code: 'UNSUPPORTED_MEDIA_TYPE' });
      expect(res.body.message).toMatch(/application\/json/);
    }
    for (const text of ['{"version": 1,', '\ufeff{"version": 1}', "{'version': 1}", '{"version": 1}}', 'NaN']) {
      const res = await as(app, me, 'patch', url).set('content-type', 'application/json').send(text);
      expect(res.status, text).toBe(400);
      expect(typeof res.body.code).toBe('string');
    }
    const latin1 = await as(app, me, 'patch', url).set('content-type', 'application/json; charset=latin1').send(body);
    expect(latin1.status).toBe(415);
    expect(latin1.body.message).toMatch(/character set/);
    // Every JSON route answers the same way: never a success or a 5xx for a body it cannot read.
    for (const r of Object.keys(bodies)) {
      const [method, path] = r.split(' ');
      const res = await as(app, me, method.toLowerCase() as 'post', fillIds(path, ids))
        .set('content-type', 'text/plain')
        .send(JSON.stringify(bodies[r]));
      expect(res.status, r).toBe(415);
    }
  });

  it('refuses a body over the JSON limit with 413 on a route that saves cells (8 MB there, for a table of 200 000 values)', async () => {
    const res = await as(app, me, 'patch', `/api/sheets/${ids.sheet}/cells/${ids.cell}`).send({
      version: 1,
      cell: { kind: 'calc', source: 'x'.repeat(9 * 1024 * 1024) },
    });
    expect(res.status).toBe(413);
    expect(res.body.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it('refuses uploads whose name lies about their content, on every upload route', async () => {
    const lies: [Buffer, string][] = [
      [PNG, 'drawing.pdf'],
      [PDF, 'photo.png'],
      [ELF, 'readings.csv'],
      [ELF, 'photo.png'],
      [ZIP, 'notes.txt'],
      [PNG, 'photo.png.exe'],
      [Buffer.from('<html><script>alert(1)</script></html>'), 'page.png'],
      [Buffer.from('MZ\x90\x00'), 'report.pdf'],
      [PNG, 'photo'],
      [PNG, 'photo.\u202egnp'],
    ];
    const sheet = `/api/sheets/${ids.sheet}`;
    for (const [content, name] of lies) {
      const res = await as(app, me, 'post', `${sheet}/attachments`).attach('file', content, name);
      expect(res.status, `attachment ${name}`).toBe(415);
      expect(res.body.message, name).toMatch(/its (name|content)|not a kind of file|it is text/);
    }
    // A CSV import takes text only, whatever the name.
    for (const [content, name] of [
      [PNG, 'harmonics.csv'],
      [ZIP, 'harmonics.csv'],
      [ELF, 'harmonics.csv'],
    ] as const) {
      const res = await as(app, me, 'post', `${sheet}/cells/import-csv`).field('version', '1').field('position', '0').attach('file', content, name);
      expect(res.status, `csv ${name}`).toBe(415);
    }
    // Verification takes PDFs only; the certificate upload takes PKCS#12 only.
    expect((await request(app.getHttpServer()).post('/api/verify').set('x-ampwright-csrf', '1').attach('file', PNG, 'package.pdf')).status).toBe(415);
    const owner = await makeCaller(app, ['owner']);
    const cert = await as(app, owner, 'post', '/api/firm/certificate').field('password', 'x').attach('file', PNG, 'firm.p12');
    expect(cert.status).toBeGreaterThanOrEqual(400);
    expect(cert.status).toBeLessThan(500);
    expect(cert.body.message).toMatch(/PKCS#12|certificate/i);
    // A name with a path keeps only its last part; a file in the wrong field, or two files, are refused.
    const wrongField = await as(app, me, 'post', `${sheet}/attachments`).attach('document', PNG, 'photo.png');
    expect(wrongField.status).toBe(400);
    const two = await as(app, me, 'post', `${sheet}/attachments`).attach('file', PNG, 'a.png').attach('file', PNG, 'b.png');
    expect([400, 413]).toContain(two.status);
    expect(two.body.code).toBeDefined();
  });
});
