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
});
