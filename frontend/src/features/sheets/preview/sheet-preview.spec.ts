import { describe, expect, it, vi } from 'vitest';
import type { CellDto, CellResult, SheetDto, SheetFile } from '@ampwright/common';
import { SheetPreview, type PreviewEngine } from './sheet-preview';

const calc = (values: Record<string, string>): CellResult =>
  ({
    kind: 'calc',
    status: 'ok',
    errors: [],
    warnings: [],
    lines: [],
    values: Object.fromEntries(Object.entries(values).map(([k, display]) => [k, { display }])),
  }) as unknown as CellResult;

const cell = (id: string, source: string, results: CellResult | null): CellDto => ({ id, kind: 'calc', fields: { source }, results }) as unknown as CellDto;
const sheet = (version: number, cells: CellDto[]): SheetDto => ({ id: 's1', version, settings: {}, cells }) as unknown as SheetDto;

/** An engine under the test's control: each evaluation waits until the test answers it. */
function controlledEngine() {
  const calls: { sheet: Pick<SheetFile, 'cells' | 'settings'>; answer: (r: CellResult[] | Error) => void; partial?: (r: CellResult[]) => void }[] = [];
  const engine: PreviewEngine = {
    evaluate: (s, partial) => new Promise((resolve, reject) => calls.push({ sheet: s, partial, answer: (r) => (r instanceof Error ? reject(r) : resolve(r)) })),
    dispose: vi.fn(),
  };
  return { engine, calls };
}
const settle = () => new Promise((r) => setTimeout(r, 0));

describe('SheetPreview', () => {
  const stored = sheet(3, [cell('a', 'R = 12 ohm', calc({ R: '12 Ω' })), cell('b', 'Z = R', calc({ Z: '12 Ω' }))]);

  /** The stored sheet with R typed as 24 ohm, previewed. */
  async function previewedAt24Ohm() {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    p.setDraft('a', { kind: 'calc', source: 'R = 24 ohm' });
    calls[0].answer([calc({ R: '24 Ω' }), calc({ Z: '24 Ω' })]);
    await settle();
    return p;
  }

  it('shows the stored results while nothing is typed, and asks the engine nothing', () => {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    expect(p.view('b')).toEqual({ result: stored.cells[1].results, preview: false, differs: null });
    expect(calls).toHaveLength(0);
  });

  it('evaluates the sheet with the draft in place and shows, as a preview, the results it changes', async () => {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    const heard = vi.fn();
    p.subscribe(heard);
    p.setDraft('a', { kind: 'calc', source: 'R = 24 ohm' });
    expect(calls[0].sheet.cells).toEqual([
      { kind: 'calc', source: 'R = 24 ohm' },
      { kind: 'calc', source: 'Z = R' },
    ]);
    const ahead = [calc({ R: '24 Ω' }), calc({ Z: '24 Ω' })];
    calls[0].answer(ahead);
    await settle();
    expect(p.view('a')).toEqual({ result: ahead[0], preview: true, differs: null });
    expect(p.view('b')).toEqual({ result: ahead[1], preview: true, differs: null });
    expect(heard).toHaveBeenCalled();

    // Saved: the stored sheet holds the draft's content with the same results; they stand, with nothing to say.
    const saved = sheet(4, [cell('a', 'R = 24 ohm', calc({ R: '24 Ω' })), cell('b', 'Z = R', calc({ Z: '24 Ω' }))]);
    p.setDraft('a', null);
    p.setSheet(saved);
    expect(p.view('a')).toEqual({ result: saved.cells[0].results, preview: false, differs: null });
    expect(p.view('b')).toEqual({ result: saved.cells[1].results, preview: false, differs: null });
  });

  it('shows, never hides, a stored result that differs from the preview of the same content', async () => {
    const p = await previewedAt24Ohm();
    const saved = sheet(4, [cell('a', 'R = 24 ohm', calc({ R: '24 Ω' })), cell('b', 'Z = R', calc({ Z: '24.1 Ω' }))]);
    p.setDraft('a', null);
    p.setSheet(saved);
    expect(p.view('b')).toEqual({ result: saved.cells[1].results, preview: false, differs: 'Z: preview 24 Ω, stored 24.1 Ω' });
    expect(p.view('a')?.differs).toBeNull();
  });

  it('drops a preview of content nobody is typing any more (someone else changed the stored sheet), and compares nothing', async () => {
    const p = await previewedAt24Ohm();
    p.setDraft('a', null);
    p.setSheet(sheet(5, [cell('a', 'R = 24 ohm', calc({ R: '24 Ω' })), cell('b', 'Z = 2 R', calc({ Z: '48 Ω' }))]));
    expect(p.view('b')).toEqual({ result: calc({ Z: '48 Ω' }), preview: false, differs: null });
  });

  it('asks the engine for the newest sheet only, once the one it is working on is done', async () => {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    p.setDraft('a', { kind: 'calc', source: 'R = 2 ohm' });
    p.setDraft('a', { kind: 'calc', source: 'R = 24 ohm' });
    p.setDraft('a', { kind: 'calc', source: 'R = 245 ohm' });
    expect(calls).toHaveLength(1);
    calls[0].answer([calc({ R: '2 Ω' }), calc({ Z: '2 Ω' })]);
    await settle();
    expect(calls).toHaveLength(2);
    expect(calls[1].sheet.cells[0]).toEqual({ kind: 'calc', source: 'R = 245 ohm' });
  });

  it("shows the first cells' results as they come, and compares nothing until every cell's are in", async () => {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    p.setDraft('a', { kind: 'calc', source: 'R = 24 ohm' });
    calls[0].partial?.([calc({ R: '24 Ω' })]);
    expect(p.view('a')).toMatchObject({ preview: true, result: calc({ R: '24 Ω' }) });
    expect(p.view('b')).toEqual({ result: stored.cells[1].results, preview: false, differs: null });
    // Saved before the rest came: a partial preview is not compared with the stored results.
    p.setDraft('a', null);
    p.setSheet(sheet(4, [cell('a', 'R = 24 ohm', calc({ R: '24.5 Ω' })), cell('b', 'Z = R', calc({ Z: '24 Ω' }))]));
    expect(p.view('a')?.differs).toBeNull();
  });

  it('falls back to the stored results when the engine fails', async () => {
    const { engine, calls } = controlledEngine();
    const p = new SheetPreview(engine);
    p.setSheet(stored);
    p.setDraft('a', { kind: 'calc', source: 'R = 24 ohm' });
    calls[0].answer(new Error('the preview took too long'));
    await settle();
    expect(p.view('b')).toEqual({ result: stored.cells[1].results, preview: false, differs: null });
  });
});
