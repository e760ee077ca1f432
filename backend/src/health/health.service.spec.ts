import type { MikroORM } from '@mikro-orm/core';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ObjectStoreService } from '../files/object-store.service';
import type { MailService } from '../mail/mail.service';
import { HealthService } from './health.service';

function setup(database = true) {
  const orm = { isConnected: vi.fn(async () => database) };
  const mail = { isReachable: vi.fn(async () => true) };
  const store = { isReachable: vi.fn(async () => true) };
  const service = new HealthService(orm as unknown as MikroORM, mail as unknown as MailService, store as unknown as ObjectStoreService);
  return { service, orm, mail, store };
}

describe('HealthService', () => {
  afterEach(() => vi.useRealTimers());

  it('asks the database every time, and the mail server and object store at most every 30 s', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    const { service, orm, mail, store } = setup();
    await service.check();
    await service.check();
    expect(orm.isConnected).toHaveBeenCalledTimes(2);
    expect(mail.isReachable).toHaveBeenCalledTimes(1);
    expect(store.isReachable).toHaveBeenCalledTimes(1);
    vi.setSystemTime(Date.now() + 30_001);
    expect(await service.check()).toMatchObject({ status: 'ok', checks: { database: 'up', mail: 'up', objectStore: 'up' } });
    expect(mail.isReachable).toHaveBeenCalledTimes(2);
  });

  it('is down when the database is, whatever the others say', async () => {
    const { service } = setup(false);
    expect(await service.check()).toMatchObject({ status: 'down', checks: { database: 'down' } });
  });
});
