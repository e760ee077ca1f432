import type { ConfigService } from '@nestjs/config';
import type { Request } from 'express';
import { describe, expect, it } from 'vitest';
import type { Environment } from '../config/environment';
import { MetricsController } from './metrics.controller';

const controller = (token?: string) => new MetricsController({ get: () => token } as unknown as ConfigService<Environment, true>);
const from = (remoteAddress: string, authorization?: string, headers: Record<string, string> = {}) =>
  ({ socket: { remoteAddress }, get: (name: string) => (name === 'authorization' ? authorization : headers[name]) }) as unknown as Request;

describe('MetricsController', () => {
  it('without a token answers only this machine, and is not there for anyone else', async () => {
    expect(await controller().get(from('127.0.0.1'))).toMatch(/ampwright_/);
    expect(await controller().get(from('::ffff:127.0.0.1'))).toMatch(/ampwright_/);
    await expect(controller().get(from('203.0.113.9'))).rejects.toMatchObject({ status: 404 });
  });

  it('without a token refuses what a proxy on this machine forwards (the client is not local)', async () => {
    await expect(controller().get(from('127.0.0.1', undefined, { 'x-forwarded-for': '203.0.113.9' }))).rejects.toMatchObject({ status: 404 });
    await expect(controller().get(from('127.0.0.1', undefined, { forwarded: 'for=203.0.113.9' }))).rejects.toMatchObject({ status: 404 });
  });

  it('with a token answers only its bearer, wherever it asks from', async () => {
    const token = 'scrape-me-please-0123';
    expect(await controller(token).get(from('203.0.113.9', `Bearer ${token}`))).toMatch(/ampwright_/);
    await expect(controller(token).get(from('127.0.0.1'))).rejects.toMatchObject({ status: 404 });
    await expect(controller(token).get(from('203.0.113.9', 'Bearer wrong-token-wrong-t'))).rejects.toMatchObject({ status: 404 });
  });
});
