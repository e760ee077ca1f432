import type { Request, Response } from 'express';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { createLogger } from '../logger';
import { assignRequestId, requestIdOf } from './request-id';

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
});
