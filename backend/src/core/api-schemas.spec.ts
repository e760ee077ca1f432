import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

describe('api-schemas.json (what each route answers, for the OpenAPI document)', () => {
  it('is what the controllers declare today (else run `npm run api:schemas -w backend`)', async () => {
    // @ts-expect-error -- a plain ES module script, without types
    const { apiSchemas } = (await import('../../scripts/api-schemas.mjs')) as { apiSchemas: () => unknown };
    const committed = JSON.parse(readFileSync(join(__dirname, 'api-schemas.json'), 'utf8')) as unknown;
    expect(apiSchemas(), 'api-schemas.json is out of date: run `npm run api:schemas -w backend`').toEqual(committed);
    // The generator reads the whole program (about 5–15 s here): a bound for a slow machine.
  }, 120000);
});
