import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api } from './api-client';

function respond(status: number, body: unknown) {
  vi.stubGlobal(
    'fetch',
    vi.fn(async () => new Response(typeof body === 'string' ? body : JSON.stringify(body), { status })),
  );
}

describe('api client', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('returns the parsed body of a success', async () => {
    respond(200, { status: 'ok' });
    await expect(api.get('/health')).resolves.toEqual({ status: 'ok' });
  });

  it("throws an ApiError carrying the server's code, message and field details", async () => {
    respond(400, {
      statusCode: 400,
      code: 'VALIDATION_FAILED',
      message: 'title must not be empty',
      details: [{ field: 'title', message: 'title must not be empty' }],
    });
    const error = await api.post('/projects', {}).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'VALIDATION_FAILED', details: [{ field: 'title' }] });
  });

  it('returns an accepted error status as data', async () => {
    respond(503, { status: 'down' });
    await expect(api.get('/health', { acceptStatus: [503] })).resolves.toEqual({ status: 'down' });
  });

  it('turns a network failure into a readable error', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('Failed to fetch');
      }),
    );
    await expect(api.get('/health')).rejects.toMatchObject({ code: 'NETWORK', status: 0 });
  });
});
