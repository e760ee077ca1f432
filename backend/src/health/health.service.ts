import { MikroORM } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ENGINE_VERSION } from '@ampwright/common';
import { ObjectStoreService } from '../files/object-store.service';
import { MailService } from '../mail/mail.service';
import type { HealthResponseDto } from './dto/health-response.dto';
import { APP_VERSION } from '../version';

const withDeadline = <T>(promise: Promise<T>, ms: number, fallback: T) =>
  Promise.race([promise, new Promise<T>((resolve) => setTimeout(() => resolve(fallback), ms).unref())]);

/** How long a check of the mail server or the object store is trusted (each costs a connection); the database is asked every time. */
const REMEMBER_MS = 30_000;

@Injectable()
export class HealthService {
  private readonly remembered = new Map<string, { until: number; value: Promise<boolean> }>();

  constructor(
    private readonly orm: MikroORM,
    private readonly mail: MailService,
    private readonly objectStore: ObjectStoreService,
  ) {}

  private async databaseUp(): Promise<boolean> {
    try {
      return await this.orm.isConnected();
    } catch {
      return false;
    }
  }

  /** A service's reachability, asked at most every REMEMBER_MS (a check in flight is shared by the calls that wait for it). */
  private remember(name: string, ask: () => Promise<boolean>): Promise<boolean> {
    const now = Date.now();
    const known = this.remembered.get(name);
    if (known && known.until > now) return known.value;
    const value = withDeadline(ask(), 3000, false);
    this.remembered.set(name, { until: now + REMEMBER_MS, value });
    return value;
  }

  async check(): Promise<HealthResponseDto> {
    const [database, mail, objectStore] = await Promise.all([
      withDeadline(this.databaseUp(), 3000, false),
      this.remember('mail', () => this.mail.isReachable()),
      this.remember('objectStore', () => this.objectStore.isReachable()),
    ]);
    const status = !database ? 'down' : mail && objectStore ? 'ok' : 'degraded';
    return {
      status,
      version: APP_VERSION,
      engineVersion: ENGINE_VERSION,
      checks: { database: database ? 'up' : 'down', mail: mail ? 'up' : 'down', objectStore: objectStore ? 'up' : 'down' },
    };
  }
}
