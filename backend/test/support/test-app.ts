import 'reflect-metadata';
import type { INestApplication } from '@nestjs/common';
import { Test } from '@nestjs/testing';
import { AppModule } from '../../src/app.module';
import { configureApp } from '../../src/bootstrap';

/** Boots the whole app against the test database and fakes that scripts/test.mjs provisioned. */
export async function createTestApp(): Promise<INestApplication> {
  if (!process.env.DB_NAME?.endsWith('_test')) {
    throw new Error('integration tests run only against a *_test database: run them through `npm test`');
  }
  const moduleRef = await Test.createTestingModule({ imports: [AppModule] }).compile();
  const app = moduleRef.createNestApplication({ bodyParser: false, logger: ['error', 'warn'] });
  configureApp(app);
  await app.init();
  return app;
}

export interface SinkMessage {
  id: number;
  to: string[];
  from: string;
  subject: string;
  text: string;
  html: string;
}

const mailApi = () => {
  const url = process.env.MAIL_API_URL;
  if (!url) throw new Error('MAIL_API_URL is not set: run integration tests through `npm test`');
  return url;
};

/**
 * Waits for the SMTP sink to hold a message for this address (delivery is asynchronous: the worker looks
 * every 500 ms). The bound is generous for a slow CI machine; a message that arrives returns at once.
 */
export async function waitForMail(to: string, match: (m: SinkMessage) => boolean = () => true, timeoutMs = 15_000): Promise<SinkMessage> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const res = await fetch(`${mailApi()}/messages?to=${encodeURIComponent(to)}`);
    const found = ((await res.json()) as SinkMessage[]).find(match);
    if (found) return found;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`no message to ${to} arrived within ${timeoutMs} ms`);
}
