import type { Request, Response } from 'express';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { createLogger } from '../logger';
import { assignRequestId, currentRequestId, requestIdOf, withRequestId } from './request-id';

function run(incoming?: string) {
  const req = { get: (name: string) => (name === 'x-request-id' ? incoming : undefined) } as unknown as Request;
  const headers: Record<string, string> = {};
  const res = { setHeader: (name: string, value: string) => (headers[name] = value) } as unknown as Response;
  const next = vi.fn();
  assignRequestId(req, res, next);
  return { id: requestIdOf(req), headers, next };
}

describe('request ids', () => {
  afterEach(() => vi.restoreAllMocks());

  it('gives a request without an id a new one, answered in X-Request-Id', () => {
    const { id, headers, next } = run();
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    expect(headers['x-request-id']).toBe(id);
    expect(next).toHaveBeenCalledTimes(1);
  });

  it("keeps a proxy's well-formed id, and replaces one that could forge a log line", () => {
    expect(run('edge-7f3a_91').id).toBe('edge-7f3a_91');
    expect(run('x"}\n{"level":"error').id).toMatch(/^[0-9a-f-]{36}$/);
    expect(run('a'.repeat(65)).id).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('writes the log as one JSON object a line, the request id among its fields', () => {
    const lines: string[] = [];
    vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => (lines.push(String(chunk)), true));
    createLogger('json').log({ requestId: 'edge-1', method: 'GET', path: '/api/health', status: 200, ms: 1.5 }, 'HTTP');
    const line = JSON.parse(lines.join('').trim());
    expect(line).toMatchObject({ level: 'log', context: 'HTTP', message: { requestId: 'edge-1', status: 200 } });
  });

  it('names the request in every line written on its behalf — its handler, its evaluation, a job it queued — and in no other', () => {
    const lines: string[] = [];
    vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => (lines.push(String(chunk)), true));
    const logger = createLogger('json');
    let queued: string | undefined;
    const req = { get: () => 'edge-42' } as unknown as Request;
    const res = { setHeader: () => undefined } as unknown as Response;
    // The request's work runs inside the middleware's next(), and so does what it awaits.
    assignRequestId(req, res, () => {
      logger.warn({ event: 'evaluation stopped', reason: 'timeout' }, 'Evaluation');
      queued = currentRequestId();
    });
    logger.log('package worker idle', 'PackagesService');
    // A job run later, on behalf of the request that queued it.
    withRequestId(queued, () => logger.log('package made', 'PackagesService'));
    const [evaluation, idle, job] = lines.map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(evaluation).toMatchObject({ context: 'Evaluation', requestId: 'edge-42', message: { reason: 'timeout' } });
    expect(idle.requestId).toBeUndefined();
    expect(job).toMatchObject({ context: 'PackagesService', requestId: 'edge-42', message: 'package made' });
    expect(currentRequestId()).toBeUndefined();
  });
});
