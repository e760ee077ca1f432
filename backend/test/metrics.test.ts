import type { INestApplication } from '@nestjs/common';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, makeCaller } from './support/sessions';
import { createTestApp } from './support/test-app';

describe('metrics (Prometheus text format)', () => {
  let app: INestApplication;
  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  it("counts requests by route pattern and status, and shows the process's own figures, to a scraper on this machine", async () => {
    await request(app.getHttpServer()).get('/api/health').expect(200);
    await request(app.getHttpServer()).get(`/api/sheets/${'0'.repeat(8)}-0000-4000-8000-${'0'.repeat(12)}`);
    const res = await request(app.getHttpServer()).get('/api/metrics').expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/plain/);
    expect(res.text).toMatch(/ampwright_http_request_duration_seconds_count\{method="GET",route="\/api\/health",status="200"\} [1-9]/);
    // The pattern, never the id: labels stay few whatever is asked.
    expect(res.text).toMatch(/route="\/api\/sheets\/:id",status="401"/);
    expect(res.text).not.toMatch(/route="\/api\/sheets\/0/);
    expect(res.text).toMatch(/ampwright_process_resident_memory_bytes \d+/);
    expect(res.text).toMatch(/ampwright_nodejs_eventloop_lag_seconds/);
  });

  it('shows the evaluation processes: work by kind and outcome, its time, and the queue', async () => {
    const engineer = await makeCaller(app, ['engineer']);
    const project = (
      await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'M-1', title: 'Metrics', clientOrganisation: 'Client', site: 'Site' }).expect(201)
    ).body;
    await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`).send({ number: 'C-1', templateId: 'series-rlc-steady-state' }).expect(201);
    const res = await request(app.getHttpServer()).get('/api/metrics').expect(200);
    expect(res.text).toMatch(/ampwright_evaluations_total\{kind="evaluate",outcome="ok"\} [1-9]/);
    expect(res.text).toMatch(/ampwright_evaluation_duration_seconds_count\{kind="evaluate",outcome="ok"\} [1-9]/);
    expect(res.text).toMatch(/ampwright_evaluation_queue_length 0\n/);
    expect(res.text).toMatch(/# TYPE ampwright_package_job_duration_seconds histogram/);
    expect(res.text).toMatch(/# TYPE ampwright_package_jobs_total counter/);
  });
});
