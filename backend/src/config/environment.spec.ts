import { describe, expect, it } from 'vitest';
import { validateEnvironment } from './environment';

const base = { DB_PASSWORD: 'x', S3_ACCESS_KEY: 'a', S3_SECRET_KEY: 'b' };

describe('validateEnvironment', () => {
  it('fills local defaults around the required secrets', () => {
    const env = validateEnvironment(base);
    expect(env.APP_PORT).toBe(3000);
    expect(env.DB_PORT).toBe(3307);
    expect(env.S3_ENDPOINT).toBe('http://127.0.0.1:4569');
  });

  it('converts numeric settings from their string form', () => {
    expect(validateEnvironment({ ...base, APP_PORT: '3100' }).APP_PORT).toBe(3100);
  });

  it('stops with a readable list when a setting is missing or malformed', () => {
    const attempt = () => validateEnvironment({ S3_ACCESS_KEY: 'a', S3_SECRET_KEY: 'b', APP_PORT: 'eighty' });
    expect(attempt).toThrow(/^The configuration is not valid/);
    expect(attempt).toThrow(/DB_PASSWORD must be set/);
    expect(attempt).toThrow(/APP_PORT must be an integer/);
  });
});

describe('validateEnvironment in production', () => {
  const local = {
    NODE_ENV: 'production',
    DB_PASSWORD: 'ampwright-local-only',
    S3_ACCESS_KEY: 'S3RVER',
    S3_SECRET_KEY: 'S3RVER',
    APP_HOST: '0.0.0.0',
    APP_URL: 'https://calc.example.com',
  };

  it('refuses the local demo secrets and insecure cookies, naming what to set', () => {
    const attempt = () => validateEnvironment(local);
    expect(attempt).toThrow(/^Ampwright will not start in production with local-only settings/);
    expect(attempt).toThrow(/CERTIFICATE_SECRET is the built-in local value/);
    expect(attempt).toThrow(/DB_PASSWORD is the local demo password/);
    expect(attempt).toThrow(/S3_ACCESS_KEY and S3_SECRET_KEY are the local fake's/);
    expect(attempt).toThrow(/COOKIE_SECURE is false while the app is reached at 0\.0\.0\.0: serve it over HTTPS and set COOKIE_SECURE=true/);
  });

  it('starts with production values, and the local demo on loopback stays as it is', () => {
    const env = validateEnvironment({
      ...local,
      CERTIFICATE_SECRET: 'x'.repeat(48),
      DB_PASSWORD: 'a real one',
      S3_ACCESS_KEY: 'AKIA',
      S3_SECRET_KEY: 'secret',
      COOKIE_SECURE: 'true',
    });
    expect(env.NODE_ENV).toBe('production');
    expect(validateEnvironment({ DB_PASSWORD: 'ampwright-local-only', S3_ACCESS_KEY: 'S3RVER', S3_SECRET_KEY: 'S3RVER' }).NODE_ENV).toBe('development');
  });
});
