import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, renderHook, waitFor } from '@testing-library/react';
import type { CellDto, CellResult, SheetContentsDto, SheetDto } from '@ampwright/common';
import type { ReactNode } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sheetKeys } from './sheet-keys';
import { calcCell, sheetOf } from '../../../test-fixtures';
import { EditConflict, mergeContents, mergeSave, sameCell, useCellChange } from './change-sheet';

const cell = calcCell;
const sheet = sheetOf;

describe('mergeSave', () => {
  it('replaces changed cells, drops removed ones, adds new ones in position order and raises the version', () => {
    const before = sheet(3, [cell('a', 0, 'x = 1'), cell('b', 1, 'y = 2'), cell('c', 2, 'z = 3')]);
    const after = mergeSave(before, { version: 4, changed: [cell('b', 0, 'y = 5'), cell('n', 1, 'n = 1')], reevaluated: [], removed: ['a'] });
    expect(after.version).toBe(4);
    expect(after.cells.map((c) => [c.id, c.position])).toEqual([
      ['b', 0],
      ['n', 1],
      ['c', 2],
    ]);
    expect(after.cells[0].fields.source).toBe('y = 5');
    expect(after.cells[2]).toBe(before.cells[2]); // untouched cells keep their identity, so they do not re-render
  });

  it('puts the new results of cells evaluated afresh in place, keeping their content', () => {
    const result = { kind: 'calc', status: 'ok', errors: [], warnings: [], values: { y: { si: 7 } } } as unknown as CellResult;
    const before = sheet(3, [cell('a', 0, 'x = 1'), cell('b', 1, 'y = 2 * x')]);
    const after = mergeSave(before, { version: 4, changed: [cell('a', 0, 'x = 3.5')], reevaluated: [{ id: 'b', results: result }], removed: [] });
    expect(after.cells[1].results).toBe(result);
    expect(after.cells[1].fields).toBe(before.cells[1].fields);
    expect(after.cells[0].fields.source).toBe('x = 3.5');
  });
});

/** What a stale save's 409 carries: the version, the state and the cells' content without results. */
const contents = (version: number, cells: CellDto[]): SheetContentsDto => ({ version, state: 'being-prepared', cells });

describe('mergeContents', () => {
  it('takes the order and content of a stale answer, keeping the results of cells whose content is unchanged', () => {
    const result = { kind: 'calc', status: 'ok', errors: [], warnings: [] } as unknown as CellResult;
    const before = sheet(3, [
      { ...cell('a', 0, 'x = 1'), results: result },
      { ...cell('b', 1, 'y = 2'), results: result },
    ]);
    const after = mergeContents(before, contents(5, [cell('b', 0, 'y = 2'), cell('a', 1, 'x = 8', 'B'), cell('n', 2, 'n = 1', 'B')]));
    expect(after.version).toBe(5);
    expect(after.cells.map((c) => [c.id, c.fields.source, c.results])).toEqual([
      ['b', 'y = 2', result],
      ['a', 'x = 8', null],
      ['n', 'n = 1', null],
    ]);
    expect(after.title).toBe('T');
  });
});

describe('sameCell', () => {
  it('ignores key order, not values', () => {
    expect(sameCell({ kind: 'check', condition: 'a', basis: 'b' }, { basis: 'b', kind: 'check', condition: 'a' })).toBe(true);
    expect(sameCell({ kind: 'calc', source: 'a' }, { kind: 'calc', source: 'b' })).toBe(false);
  });
});

/** Answers of a fake server, in order; each request's body is recorded. */
function serverAnswers(...answers: { status: number; body: unknown }[]) {
  const sent: { url: string; body: unknown }[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init: RequestInit) => {
      sent.push({ url, body: init.body ? JSON.parse(String(init.body)) : undefined });
      const a = answers.shift()!;
      return new Response(JSON.stringify(a.body), { status: a.status, headers: { 'Content-Type': 'application/json' } });
    }),
  );
  return sent;
}

function setup(initial: SheetDto) {
  const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
  client.setQueryData(sheetKeys.one('s1'), initial);
  const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={client}>{children}</QueryClientProvider>;
  const { result } = renderHook(() => useCellChange('s1'), { wrapper });
  return { client, result };
}

describe('useCellChange after someone else saved', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('sends a change to a cell nobody else touched again on the new version', async () => {
    const theirs = contents(5, [cell('a', 0, 'x = 1'), cell('b', 1, 'y = 9', 'B')]);
    const sent = serverAnswers(
      { status: 409, body: { code: 'STALE_VERSION', message: 'stale', current: theirs } },
      { status: 200, body: { version: 6, changed: [cell('a', 0, 'x = 2')], reevaluated: [], removed: [] } },
    );
    const { client, result } = setup(sheet(4, [cell('a', 0, 'x = 1'), cell('b', 1, 'y = 2')]));
    await act(() =>
      result.current.mutateAsync({ type: 'update', cellId: 'a', cell: { kind: 'calc', source: 'x = 2' }, base: { kind: 'calc', source: 'x = 1' } }),
    );
    expect(sent.map((s) => (s.body as { version: number }).version)).toEqual([4, 5]);
    const cached = client.getQueryData<SheetDto>(sheetKeys.one('s1'))!;
    expect(cached.version).toBe(6);
    expect(cached.cells.map((c) => c.fields.source)).toEqual(['x = 2', 'y = 9']);
  });

  it('refuses, as a conflict with their text, a change to a cell someone else also changed, and sends nothing more', async () => {
    const theirs = contents(5, [cell('a', 0, 'x = 7', 'B')]);
    const sent = serverAnswers({ status: 409, body: { code: 'STALE_VERSION', message: 'stale', current: theirs } });
    const { result } = setup(sheet(4, [cell('a', 0, 'x = 1')]));
    act(() => result.current.mutate({ type: 'update', cellId: 'a', cell: { kind: 'calc', source: 'x = 2' }, base: { kind: 'calc', source: 'x = 1' } }));
    await waitFor(() => expect(result.current.isError).toBe(true));
    expect(result.current.error).toBeInstanceOf(EditConflict);
    expect((result.current.error as EditConflict).theirs?.fields.source).toBe('x = 7');
    expect(sent).toHaveLength(1);
  });
});
