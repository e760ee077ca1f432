import { MikroORM } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ENGINE_VERSION } from '@ampwright/common';
import { ObjectStoreService } from '../files/object-store.service';
import { MailService } from '../mail/mail.service';
import type { HealthResponseDto } from './dto/health-response.dto';
import { APP_VERSION } from '../version';

const withDeadline = <T>(promise: Promise<T>, ms: number, fallback: T) =>
  Promise.race([promise, new Promise<T>((resolve) => setTimeout(() => resolve(fallback), ms).unref())]);

@Injectable()
export class HealthService {
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

  async check(): Promise<HealthResponseDto> {
    const [database, mail, objectStore] = await Promise.all([
      withDeadline(this.databaseUp(), 3000, false),
      withDeadline(this.mail.isReachable(), 3000, false),
      withDeadline(this.objectStore.isReachable(), 3000, false),
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
