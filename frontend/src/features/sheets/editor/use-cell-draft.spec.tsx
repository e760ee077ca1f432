import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, renderHook, waitFor } from '@testing-library/react';
import type { CellDto, SheetDto } from '@ampwright/common';
import type { ReactNode } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sheetKeys } from '../api/sheet-keys';
import { calcCell, sheetOf } from '../../../test-fixtures';
import { textChange } from './code-editor';
import { useCellDraft } from './use-cell-draft';

const cell = (source: string) => calcCell('a', 0, source);
const sheet = (c: CellDto) => sheetOf(4, [c]);

describe('useCellDraft', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('keeps the saved text on screen until the cell it is given holds it (never the old text in between)', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(
        async () =>
          new Response(JSON.stringify({ version: 5, changed: [cell('x = 2')], reevaluated: [], removed: [] }), {
            status: 200,
            headers: { 'Content-Type': 'application/json' },
          }),
      ),
    );
    const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
    client.setQueryData(sheetKeys.one('s1'), sheet(cell('x = 1')));
    const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={client}>{children}</QueryClientProvider>;
    // The component is still given the cell as it was before the save (its parent renders later).
    const { result, rerender } = renderHook(({ c }) => useCellDraft('s1', c), { wrapper, initialProps: { c: cell('x = 1') } });

    act(() => result.current.edit({ kind: 'calc', source: 'x = 2' }));
    act(() => result.current.flush());
    await waitFor(() => expect(result.current.state).toBe('saved'));
    expect(result.current.value.source).toBe('x = 2');
    expect(client.getQueryData<SheetDto>(sheetKeys.one('s1'))!.cells[0].fields.source).toBe('x = 2');

    rerender({ c: cell('x = 2') });
    expect(result.current.dirty).toBe(false);
    expect(result.current.value.source).toBe('x = 2');
    expect(result.current.state).toBe('saved');
  });
});

describe('textChange', () => {
  it('replaces only what differs, so a cursor before or after it stays put', () => {
    expect(textChange('V_s = 2301 V', 'V_s = 230 V')).toEqual({ from: 9, to: 10, insert: '' });
    expect(textChange('a = 1', 'a = 12')).toEqual({ from: 5, to: 5, insert: '2' });
    expect(textChange('x = 1\ny = 2', 'x = 3\ny = 2')).toEqual({ from: 4, to: 5, insert: '3' });
    expect(textChange('aaa', 'aa')).toEqual({ from: 2, to: 3, insert: '' });
    expect(textChange('', 'q = 1')).toEqual({ from: 0, to: 0, insert: 'q = 1' });
    expect(textChange('same', 'same')).toBeNull();
  });

  it('gives the text it was asked for', () => {
    const pairs = [
      ['abcabc', 'abc'],
      ['R = 1 ohm', 'R = 10 ohm'],
      ['µ = 4π', 'µ = 4ππ'],
      ['x', ''],
    ];
    for (const [a, b] of pairs) {
      const c = textChange(a, b)!;
      expect(a.slice(0, c.from) + c.insert + a.slice(c.to)).toBe(b);
    }
  });
});
