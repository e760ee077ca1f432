import { EntityManager } from '@mikro-orm/core';
import { Injectable, type OnApplicationBootstrap } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { compare } from 'bcrypt';
import type { Environment } from '../config/environment';
import { User } from '../users/entities/user.entity';
import { DEMO_PASSWORD, DEMO_PEOPLE } from './seeders/demo.seeder';

/** The demo accounts that still open with the published demo password (README, "Demo data"). */
export async function openDemoAccounts(em: EntityManager): Promise<string[]> {
  const users = await em.fork().find(User, { email: { $in: DEMO_PEOPLE.map((p) => p.email) } }, { fields: ['email', 'passwordHash'] });
  const open: string[] = [];
  for (const user of users) if (await compare(DEMO_PASSWORD, user.passwordHash)) open.push(user.email);
  return open;
}

/** A production instance refuses to start while anyone can sign in with the published demo password. */
@Injectable()
export class DemoAccountsCheck implements OnApplicationBootstrap {
  constructor(
    private readonly em: EntityManager,
    private readonly config: ConfigService<Environment, true>,
  ) {}

  async onApplicationBootstrap(): Promise<void> {
    if (this.config.get('NODE_ENV', { infer: true }) !== 'production') return;
    const open = await openDemoAccounts(this.em);
    if (open.length) {
      throw new Error(
        `Ampwright will not start in production while demo accounts open with the published demo password: ${open.join(', ')}. Remove them, or give them passwords of their own.`,
      );
    }
  }
}
