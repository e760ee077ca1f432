// Settings shared by the lifecycle scripts and handed to the app as environment variables.
// Values come from the environment, then from an optional .env at the repository root, then from
// these local defaults. The app validates the same variables again at start-up (src/config).
import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
export const DATA = join(ROOT, '.data');

if (existsSync(join(ROOT, '.env'))) process.loadEnvFile(join(ROOT, '.env'));

const env = (name, fallback) => process.env[name] ?? fallback;

export const settings = {
  appHost: env('APP_HOST', '127.0.0.1'),
  appPort: Number(env('APP_PORT', '3000')),
  dbHost: env('DB_HOST', '127.0.0.1'),
  dbPort: Number(env('DB_PORT', '3307')),
  // The private instance's socket (provision.mjs starts it there), unless another database is named.
  dbSocket: env('DB_SOCKET', process.env.DB_HOST ? '' : join(DATA, 'run', 'mysqld.sock')),
  dbName: env('DB_NAME', 'ampwright'),
  dbUser: env('DB_USER', 'ampwright'),
  dbPassword: env('DB_PASSWORD', 'ampwright-local-only'),
  smtpPort: Number(env('SMTP_PORT', '1025')),
  mailApiPort: Number(env('MAIL_API_PORT', '1080')),
  s3Port: Number(env('S3_PORT', '4569')),
  s3Bucket: env('S3_BUCKET', 'ampwright-files'),
  s3AccessKey: env('S3_ACCESS_KEY', 'S3RVER'),
  s3SecretKey: env('S3_SECRET_KEY', 'S3RVER'),
};

/** The environment the Nest app reads (see backend/src/config/environment.ts). */
export function appEnvironment(overrides = {}) {
  const s = { ...settings, ...overrides };
  return {
    ...process.env,
    // The local demo is not production: production refuses the local-only secrets and the demo accounts
    // this command sets up (backend/src/config/environment.ts).
    NODE_ENV: process.env.NODE_ENV ?? 'development',
    APP_HOST: s.appHost,
    APP_PORT: String(s.appPort),
    DB_HOST: s.dbHost,
    DB_PORT: String(s.dbPort),
    ...(s.dbSocket ? { DB_SOCKET: s.dbSocket } : {}),
    DB_NAME: s.dbName,
    DB_USER: s.dbUser,
    DB_PASSWORD: s.dbPassword,
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(s.smtpPort),
    S3_ENDPOINT: `http://127.0.0.1:${s.s3Port}`,
    S3_BUCKET: s.s3Bucket,
    S3_ACCESS_KEY: s.s3AccessKey,
    S3_SECRET_KEY: s.s3SecretKey,
    STATIC_DIR: join(ROOT, 'frontend', 'dist'),
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
  };
}
