import type { INestApplication } from '@nestjs/common';
import { MikroORM } from '@mikro-orm/core';
import type { EntityManager as SqlEntityManager } from '@mikro-orm/mariadb';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ObjectStoreService } from '../src/files/object-store.service';
import { Firm } from '../src/firms/entities/firm.entity';
import { MailService } from '../src/mail/mail.service';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_FIRM_NAME, DEMO_JOB_NUMBER, seedDemo } from '../src/database/seeders/demo.seeder';
import { Project, ProjectPerson } from '../src/projects/entities/project.entity';
import { Cell } from '../src/sheets/entities/cell.entity';
import { Sheet } from '../src/sheets/entities/sheet.entity';
import { createTestApp, waitForMail } from './support/test-app';

describe('the app against MariaDB and the fakes', () => {
  let app: INestApplication;

  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  it('reports the database and both fakes up on /api/health', async () => {
    const res = await request(app.getHttpServer()).get('/api/health').expect(200);
    expect(res.body).toMatchObject({ status: 'ok', checks: { database: 'up', mail: 'up', objectStore: 'up' } });
    expect(res.body.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('answers /api/health/live while the process runs, and /api/health/ready while the database answers', async () => {
    const live = await request(app.getHttpServer()).get('/api/health/live').expect(200);
    expect(live.body).toEqual({ status: 'live' });
    const ready = await request(app.getHttpServer()).get('/api/health/ready').expect(200);
    expect(ready.body).toMatchObject({ status: 'ok', checks: { database: 'up' } });
    expect(ready.headers['cache-control']).toBe('no-store');
  });

  it('answers an unknown API route with the JSON error shape, not the web app', async () => {
    const res = await request(app.getHttpServer()).get('/api/no-such-thing').expect(404);
    expect(res.body).toMatchObject({ statusCode: 404, code: 'NOT_FOUND' });
    expect(typeof res.body.message).toBe('string');
  });

  it('answers malformed JSON with 400 and a sentence', async () => {
    const res = await request(app.getHttpServer()).post('/api/health').set('content-type', 'application/json').send('{"a":').expect(400);
    expect(res.body).toMatchObject({ statusCode: 400, message: 'The request body is not valid JSON.' });
  });

  it('refuses a body over the size limit with 413', async () => {
    const big = JSON.stringify({ x: 'a'.repeat(3 * 1024 * 1024) });
    const res = await request(app.getHttpServer()).post('/api/health').set('content-type', 'application/json').send(big).expect(413);
    expect(res.body.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it("answers every request with its id (X-Request-Id), keeping a proxy's well-formed one", async () => {
    const mine = await request(app.getHttpServer()).get('/api/health');
    expect(mine.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    const proxied = await request(app.getHttpServer()).get('/api/no-such-thing').set('x-request-id', 'edge-42');
    expect([proxied.status, proxied.headers['x-request-id']]).toEqual([404, 'edge-42']);
  });

  it('sends security headers', async () => {
    const res = await request(app.getHttpServer()).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('has the migrated schema and an idempotent demo seed', async () => {
    // The app runs the MariaDB driver, whose entity manager is the SQL one the seed takes.
    const em = app.get(MikroORM).em.fork() as SqlEntityManager;
    await seedDemo(em, 4);
    expect(await seedDemo(em.fork(), 4)).toBe('demo seed: everything already present');
    expect(await em.fork().count(Firm, { name: DEMO_FIRM_NAME })).toBe(1);
  });

  it('seeds the Kestrel Ridge project with one evaluated sheet per template and its client invited', async () => {
    const em = app.get(MikroORM).em.fork();
    const project = await em.findOneOrFail(Project, { jobNumber: DEMO_JOB_NUMBER });
    const sheets = await em.find(Sheet, { project });
    expect(sheets.length).toBe(readdirSync(join(__dirname, '..', '..', 'templates')).filter((f) => f.endsWith('.json')).length);
    expect(new Set(sheets.map((s) => s.state)).size).toBeGreaterThan(1);
    const cells = await em.find(Cell, { sheet: { $in: sheets } });
    expect(cells.every((c) => c.results && (c.results as { status: string }).status === 'ok')).toBe(true);
    expect(await em.count(ProjectPerson, { project, user: { email: 'client@kestrelridge.example' }, standing: 'client' })).toBe(1);
  });

  it('delivers e-mail through the SMTP sink', async () => {
    const to = `probe-${Date.now()}@northfold.example`;
    await app.get(MailService).send({ to, subject: 'Delivery probe', text: 'plain', html: '<p>html</p>' });
    const message = await waitForMail(to);
    expect(message).toMatchObject({ subject: 'Delivery probe', text: expect.stringContaining('plain') });
  });

  it('stores and reads back an object in the S3 fake byte for byte', async () => {
    const store = app.get(ObjectStoreService);
    const body = Buffer.from(Array.from({ length: 70_000 }, (_, i) => i % 251));
    await store.put('probe/bytes.bin', body, 'application/octet-stream');
    expect((await store.get('probe/bytes.bin')).equals(body)).toBe(true);
  });
});
