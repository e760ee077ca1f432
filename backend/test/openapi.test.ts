import type { INestApplication } from '@nestjs/common';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { registeredRoutes } from './support/routes';
import { createTestApp } from './support/test-app';

/** `/api/sheets/:id` as OpenAPI writes it: `/api/sheets/{id}`. */
const openApiPath = (path: string) => path.replace(/:([A-Za-z0-9_]+)/g, '{$1}');

describe('the API described by itself (OpenAPI, @nestjs/swagger)', () => {
  let app: INestApplication;
  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  it('serves the OpenAPI document at /api/docs/json with every route the app registers, and the reader at /api/docs', async () => {
    const doc = (await request(app.getHttpServer()).get('/api/docs/json').expect(200)).body as {
      openapi: string;
      paths: Record<string, Record<string, unknown>>;
    };
    expect(doc.openapi).toMatch(/^3\./);
    const missing = registeredRoutes(app)
      .filter((route) => !route.includes(' /api/docs'))
      .filter((route) => {
        const [method, path] = route.split(' ');
        return !doc.paths[openApiPath(path)]?.[method.toLowerCase()];
      });
    expect(missing).toEqual([]);
    const page = await request(app.getHttpServer()).get('/api/docs').expect(200);
    expect(page.headers['content-type']).toMatch(/^text\/html/);
  });

  it('describes the request bodies from the DTOs: a sheet change names its fields', async () => {
    const doc = (await request(app.getHttpServer()).get('/api/docs/json').expect(200)).body as {
      components: { schemas: Record<string, { properties?: Record<string, unknown>; required?: string[] }> };
    };
    expect(Object.keys(doc.components.schemas.UpdateCellDto?.properties ?? {})).toEqual(expect.arrayContaining(['version', 'cell']));
    expect(doc.components.schemas.CreateProjectDto?.required).toEqual(expect.arrayContaining(['jobNumber', 'title']));
  });

  it("describes each route's answer from the controller's return type, and every schema it refers to exists", async () => {
    type Doc = {
      openapi: string;
      paths: Record<string, Record<string, { responses: Record<string, { content?: Record<string, { schema: { $ref?: string } }> }> }>>;
      components: { schemas: Record<string, unknown> };
    };
    const doc = (await request(app.getHttpServer()).get('/api/docs/json').expect(200)).body as Doc;
    expect(doc.openapi).toBe('3.1.0');
    const success = (path: string, method: string) => {
      const responses = doc.paths[path][method].responses;
      return responses[Object.keys(responses).find((c) => c.startsWith('2'))!];
    };
    // Every route says what it answers: JSON by a schema, a file, or nothing (204).
    const undescribed: string[] = [];
    for (const [path, methods] of Object.entries(doc.paths)) {
      if (path.startsWith('/api/docs')) continue;
      for (const [method, op] of Object.entries(methods)) {
        const codes = Object.keys(op.responses);
        const ok = success(path, method);
        if (!ok || (!ok.content && !codes.includes('204'))) undescribed.push(`${method.toUpperCase()} ${path}`);
      }
    }
    expect(undescribed).toEqual([]);
    // A sheet (streamed as stored, so named by @answers), its cells typed by kind with the fields of the sheet format.
    const resolve = (ref: string) => doc.components.schemas[ref.replace('#/components/schemas/', '')] as Record<string, unknown>;
    let sheet = success('/api/sheets/{id}', 'get').content!['application/json'].schema as Record<string, unknown>;
    while (typeof sheet.$ref === 'string') sheet = resolve(sheet.$ref);
    expect(Object.keys(sheet.properties as object)).toEqual(expect.arrayContaining(['id', 'version', 'state', 'cells']));
    expect(resolve('#/components/schemas/CellFields_calc')).toMatchObject({ properties: { source: { type: 'string' } }, required: ['source'] });
    expect(JSON.stringify(resolve('#/components/schemas/CellDto'))).toContain('CellFields_network');
    // A save answers the new version and the changed cells; a download is a file; a delete answers nothing.
    let save = success('/api/sheets/{id}/cells/{cellId}', 'patch').content!['application/json'].schema as Record<string, unknown>;
    while (typeof save.$ref === 'string') save = resolve(save.$ref);
    expect(Object.keys(save.properties as object)).toEqual(expect.arrayContaining(['version', 'changed', 'removed']));
    expect(Object.keys(success('/api/revisions/{id}/package', 'get').content!)).toEqual(['application/octet-stream']);
    expect(doc.paths['/api/sheets/{id}'].delete.responses['204']).toBeDefined();
    // No reference leads nowhere.
    const refs = [...JSON.stringify(doc).matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)].map((m) => m[1]);
    expect([...new Set(refs)].filter((name) => !(name in doc.components.schemas))).toEqual([]);
  });
});
