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
