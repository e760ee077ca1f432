import type { INestApplication } from '@nestjs/common';
import type { CellResult, SaveResultDto } from '@ampwright/common';
import { expect } from 'vitest';
import { as, type Caller } from './sessions';

/** Checks that a sheet's stored results are exactly what a fresh evaluation of its export gives; returns the sheet. */
export async function expectStoredAsFresh(app: INestApplication, caller: Caller, id: string) {
  const stored = (await as(app, caller, 'get', `/api/sheets/${id}`).expect(200)).body;
  const file = (await as(app, caller, 'get', `/api/sheets/${id}/export`).expect(200)).body;
  const fresh = (await as(app, caller, 'post', '/api/evaluate').send(file).expect(200)).body;
  expect(stored.cells.map((c: { results: unknown }) => c.results)).toEqual(fresh.cells);
  return stored;
}

/** A cell's results as a save's answer gives them: whole in `changed` when the save touched it, in `reevaluated` otherwise. */
export function savedResults(answer: SaveResultDto, cellId: string): CellResult | undefined {
  return (answer.changed.find((c) => c.id === cellId)?.results ?? answer.reevaluated.find((c) => c.id === cellId)?.results) || undefined;
}
