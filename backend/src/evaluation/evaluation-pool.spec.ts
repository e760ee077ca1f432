import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SheetFile } from '@ampwright/common';
import { EvaluationPool, type PoolLimits } from './evaluation-pool';
import { sheetFingerprint } from './sheet-fingerprint';

const sheet = (source: string, more: SheetFile['cells'] = []): SheetFile => ({
  format: 'ampwright.sheet/1',
  title: 'Pool',
  cells: [{ kind: 'calc', source }, ...more],
});
const RUNAWAY = sheet('M = ones(316, 316)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M');
const MANY: SheetFile = {
  format: 'ampwright.sheet/1',
  title: 'Many',
  cells: Array.from({ length: 2000 }, (_, k) => ({ kind: 'calc' as const, source: `M_${k} = ones(120, 120) * ones(120, 120)` })),
};
const HOG = sheet(Array.from({ length: 600 }, (_, k) => `a_${k} = ones(100000)`).join('\n'));

/** Runs `work` with a pool of its own, ready, and closes the pool after. */
async function withPool(limits: PoolLimits, work: (pool: EvaluationPool) => Promise<void>): Promise<void> {
  const pool = new EvaluationPool(limits);
  try {
    await pool.ready();
    await work(pool);
  } finally {
    await pool.close();
  }
}

describe('EvaluationPool (child processes from dist/)', () => {
  let pool: EvaluationPool;
  beforeAll(async () => {
    pool = new EvaluationPool({ processes: 3, timeoutMs: 1500, waitMs: 1000, memoryMb: 128, perTenantRunning: 2, perTenantQueued: 4 });
    await pool.ready();
  }, 30_000);
  afterAll(() => pool.close());

  it('evaluates a sheet and keeps its cache in the process that evaluated it, sending back only what differs from the base', async () => {
    const before = sheet('x = 2 V', [
      { kind: 'calc', source: 'y = x / 2 ohm' },
      { kind: 'calc', source: 'z = 3 A' },
    ]);
    const first = await pool.run({ kind: 'evaluate', sheet: before, key: 's1', base: sheetFingerprint(before) }, { tenant: 'a', key: 's1' });
    // Nothing kept yet: every cell is evaluated and every result sent, whatever the base says.
    expect(first.ok && first.value).toMatchObject({ complete: true, evaluated: [0, 1, 2] });
    expect(first.ok && first.value.results.map(([index]) => index)).toEqual([0, 1, 2]);
    const after = sheet('x = 2 V', [
      { kind: 'calc', source: 'y = x / 4 ohm' },
      { kind: 'calc', source: 'z = 3 A' },
    ]);
    const second = await pool.run({ kind: 'evaluate', sheet: after, key: 's1', base: sheetFingerprint(before), want: [0] }, { tenant: 'a', key: 's1' });
    // The kept evaluation is of the base: only the cell evaluated afresh and the one asked for come back.
    expect(second.ok && second.value).toMatchObject({ complete: false, evaluated: [1] });
    expect(second.ok && second.value.results.map(([index]) => index)).toEqual([0, 1]);
    expect(second.ok && (second.value.results[1][1] as { values: Record<string, { si: number }> }).values.y.si).toBe(0.5);
    // A base other than the kept evaluation's sheet (a save that lost, results stored by another process): everything.
    const third = await pool.run({ kind: 'evaluate', sheet: after, key: 's1', base: sheetFingerprint(before) }, { tenant: 'a', key: 's1' });
    expect(third.ok && third.value).toMatchObject({ complete: true, evaluated: [] });
    expect(third.ok && third.value.results).toHaveLength(3);
  });

  it('evaluates a one-cell edit of the sheet it keeps, sent as that cell alone, and says when it does not keep that sheet', async () => {
    const stored = sheet('x = 2 V', [
      { kind: 'calc', source: 'y = x / 2 ohm' },
      { kind: 'calc', source: 'z = 3 A' },
    ]);
    const first = await pool.run({ kind: 'evaluate', sheet: stored, key: 's2' }, { tenant: 'a', key: 's2' });
    // The process names the sheet it keeps by its fingerprint, for the server to store with the results.
    expect(first.ok && first.value.fingerprint).toBe(sheetFingerprint(stored));
    const base = sheetFingerprint(stored);
    const edited = await pool.run({ kind: 'edit', key: 's2', base, index: 0, cell: { kind: 'calc', source: 'x = 6 V' } }, { tenant: 'a', key: 's2' });
    const value = edited.ok && !('held' in edited.value) ? edited.value : undefined;
    // Evaluated as the kept sheet with cell 0 replaced: cells 0 and 1 afresh, z as kept; only those two come back.
    expect(value).toMatchObject({ complete: false, evaluated: [0, 1] });
    expect(value?.results.map(([index]) => index)).toEqual([0, 1]);
    expect((value?.results[1][1] as { values: Record<string, { si: number }> }).values.y.si).toBe(3);
    // It now keeps the edited sheet, under the fingerprint the whole edited sheet has.
    const whole = sheet('x = 6 V', stored.cells.slice(1));
    expect(value?.fingerprint).toBe(sheetFingerprint(whole));
    // The old base, another sheet's id, or a cell beyond the sheet: nothing evaluated, and it says so.
    for (const task of [
      { base, index: 0, key: 's2' },
      { base: value!.fingerprint!, index: 0, key: 's-unknown' },
      { base: value!.fingerprint!, index: 3, key: 's2' },
      { base: value!.fingerprint!, index: -1, key: 's2' },
    ]) {
      const missed = await pool.run({ kind: 'edit', ...task, cell: { kind: 'calc', source: 'x = 1 V' } }, { tenant: 'a', key: task.key });
      expect(missed).toEqual({ ok: true, value: { held: false } });
    }
    // A miss leaves what it keeps: the next edit of the right base is evaluated.
    const again = await pool.run(
      { kind: 'edit', key: 's2', base: value!.fingerprint!, index: 2, cell: { kind: 'calc', source: 'z = 4 A' } },
      { tenant: 'a', key: 's2' },
    );
    expect(again.ok && !('held' in again.value) && again.value.evaluated).toEqual([2]);
  });

  it('keeps a one-cell edit for the process that keeps its sheet while that process is busy, rather than sending it where it is not held', async () => {
    await withPool({ processes: 3, timeoutMs: 20_000, waitMs: 20_000, memoryMb: 256, perTenantRunning: 2, perTenantQueued: 4 }, async (patient) => {
      // A sheet whose evaluation takes a while, kept as s3 by the process that evaluates it; while it runs an
      // edit of it is sent, with two other processes free — neither of which keeps s3.
      const slow = sheet('x = 2 V', [{ kind: 'calc', source: 'M = ones(150, 150)\nP = M * M' }]);
      const order: string[] = [];
      const busy = patient.run({ kind: 'evaluate', sheet: slow, key: 's3' }, { tenant: 'a', key: 's3' }).then((r) => (order.push('evaluate'), r));
      const edit = patient
        .run({ kind: 'edit', key: 's3', base: sheetFingerprint(slow), index: 0, cell: { kind: 'calc', source: 'x = 8 V' } }, { tenant: 'a', key: 's3' })
        .then((r) => (order.push('edit'), r));
      const [evaluated, edited] = await Promise.all([busy, edit]);
      expect(evaluated.ok).toBe(true);
      // It waited for that process (500 ms at most, EDIT_AFFINITY_WAIT_MS) and was evaluated there: cell 0 afresh, the rest as kept.
      expect(order).toEqual(['evaluate', 'edit']);
      expect(edited.ok && !('held' in edited.value) && edited.value.evaluated).toEqual([0]);
    });
  }, 30_000);

  it("hands a one-cell edit to the process that keeps its sheet while that process runs another of the firm's edits, however long that edit takes", async () => {
    await withPool({ processes: 3, timeoutMs: 20_000, waitMs: 20_000, memoryMb: 256, perTenantRunning: 2, perTenantQueued: 4 }, async (patient) => {
      const stored = sheet('x = 2 V', [{ kind: 'calc', source: 'y = x / 2 ohm' }]);
      const base = sheetFingerprint(stored);
      const first = await patient.run({ kind: 'evaluate', sheet: stored, key: 's6' }, { tenant: 'a', key: 's6' });
      expect(first.ok).toBe(true);
      // An edit of s6 that computes for well over EDIT_AFFINITY_WAIT_MS (500 ms) runs in the process keeping s6…
      const heavy = { kind: 'calc' as const, source: 'x = 2 V\nM = ones(220, 220)\nP = M * M * M * M * M * M' };
      const order: string[] = [];
      const started = Date.now();
      const long = patient.run({ kind: 'edit', key: 's6', base, index: 0, cell: heavy }, { tenant: 'a', key: 's6' }).then((r) => (order.push('long'), r));
      await new Promise((r) => setTimeout(r, 20));
      // …and the next edit, based on what the first leaves kept, is handed to that process at once: it runs there
      // after the first, however long that takes, and is not sent after 500 ms to a free process that keeps nothing.
      const next = patient.run(
        {
          kind: 'edit',
          key: 's6',
          base: sheetFingerprint({ ...stored, cells: [heavy, stored.cells[1]] }),
          index: 1,
          cell: { kind: 'calc', source: 'y = x / 4 ohm' },
        },
        { tenant: 'a', key: 's6' },
      );
      // Counted as waiting (the queue's metric) while it waits in that process.
      expect(patient.waiting).toBe(1);
      const [ran, edited] = await Promise.all([long, next.then((r) => (order.push('next'), r))]);
      expect(patient.waiting).toBe(0);
      expect(Date.now() - started).toBeGreaterThan(500);
      // (y reads x, which is still 2 V: kept as it was.)
      expect(ran.ok && !('held' in ran.value) && ran.value.evaluated).toEqual([0]);
      expect(order).toEqual(['long', 'next']);
      expect(edited.ok && !('held' in edited.value) && edited.value.evaluated).toEqual([1]);
      expect(edited.ok && !('held' in edited.value) && (edited.value.results[0][1] as { values: Record<string, { si: number }> }).values.y.si).toBe(0.5);
    });
  }, 60_000);

  it('puts a handed-over edit back in the queue when the process dies under the edit before it, and answers it', async () => {
    await withPool({ processes: 2, timeoutMs: 20_000, waitMs: 20_000, memoryMb: 128, perTenantRunning: 1, perTenantQueued: 4 }, async (roomy) => {
      const stored = sheet('x = 2 V', [{ kind: 'calc', source: 'y = x / 2 ohm' }]);
      const base = sheetFingerprint(stored);
      expect((await roomy.run({ kind: 'evaluate', sheet: stored, key: 's7' }, { tenant: 'a', key: 's7' })).ok).toBe(true);
      // An edit that passes the memory cap, and behind it, handed over, an ordinary edit of the same sheet.
      const hog = roomy.run({ kind: 'edit', key: 's7', base, index: 0, cell: HOG.cells[0] }, { tenant: 'a', key: 's7' });
      await new Promise((r) => setTimeout(r, 20));
      const next = roomy.run({ kind: 'edit', key: 's7', base, index: 1, cell: { kind: 'calc', source: 'y = x / 4 ohm' } }, { tenant: 'a', key: 's7' });
      expect(await hog).toMatchObject({ ok: false, reason: 'memory' });
      // The process and what it kept are gone: the edit, queued again, is answered "not held" (the save then sends the whole sheet).
      expect(await next).toEqual({ ok: true, value: { held: false } });
    });
  }, 60_000);

  it("does not keep a firm's edit waiting behind another firm's task", async () => {
    await withPool({ processes: 2, timeoutMs: 20_000, waitMs: 20_000, memoryMb: 256, perTenantRunning: 1, perTenantQueued: 4 }, async (two) => {
      // The first process keeps s5, the second z (a new sheet goes to the process keeping the fewest).
      const stored = sheet('x = 2 V', [{ kind: 'calc', source: 'y = x / 2 ohm' }]);
      const first = await two.run({ kind: 'evaluate', sheet: stored, key: 's5' }, { tenant: 'a', key: 's5' });
      await two.run({ kind: 'evaluate', sheet: stored, key: 'z' }, { tenant: 'a', key: 'z' });
      // Another firm's long task takes the first process (both keep one sheet: the first free one)…
      const other = two.run({ kind: 'evaluate', sheet: sheet('M = ones(150, 150)\nP = M * M * M') }, { tenant: 'b' });
      // …so an edit of s5 goes after 50 ms to the other process, which does not keep s5, and the save would send the whole sheet.
      const edited = await two.run(
        { kind: 'edit', key: 's5', base: first.ok ? first.value.fingerprint! : '', index: 0, cell: { kind: 'calc', source: 'x = 8 V' } },
        { tenant: 'a', key: 's5' },
      );
      expect(edited).toEqual({ ok: true, value: { held: false } });
      expect((await other).ok).toBe(true);
    });
  }, 30_000);

  it('stops a task at its deadline, saying at which cell when it stopped itself, and the process lives on', async () => {
    expect(await pool.run({ kind: 'evaluate', sheet: RUNAWAY }, { tenant: 'a' })).toMatchObject({ ok: false, reason: 'timeout' });
    // Many cells, each quick: the evaluation stops itself between them and says at which.
    const many = await pool.run({ kind: 'evaluate', sheet: MANY }, { tenant: 'b' });
    expect(many).toMatchObject({ ok: false, reason: 'timeout' });
    expect(!many.ok && many.cell).toBeGreaterThan(0);
    const after = await pool.run({ kind: 'evaluate', sheet: sheet('x = 1 + 1') }, { tenant: 'a' });
    expect(after.ok && after.value.results[0][1].status).toBe('ok');
  }, 20_000);

  it('replaces a process that passes its memory cap, and carries on', async () => {
    // A deadline far away, so that on a busy machine the cap, not the clock, is what stops the sheet.
    await withPool({ processes: 2, timeoutMs: 20_000, waitMs: 1000, memoryMb: 128, perTenantRunning: 1, perTenantQueued: 2 }, async (roomy) => {
      expect(await roomy.run({ kind: 'evaluate', sheet: HOG }, { tenant: 'a' })).toMatchObject({ ok: false, reason: 'memory' });
      const after = await roomy.run({ kind: 'evaluate', sheet: sheet('x = 1 + 1') }, { tenant: 'a' });
      expect(after.ok && after.value.results[0][1].status).toBe('ok');
    });
  }, 60_000);

  it('keeps a process free for another tenant while one floods, and tells the flooder it is busy', async () => {
    await pool.ready();
    const settled: string[] = [];
    const flood = Array.from({ length: 6 }, () =>
      pool.run({ kind: 'evaluate', sheet: RUNAWAY }, { tenant: 'noisy' }).then((o) => (settled.push(o.ok ? 'ok' : o.reason), o)),
    );
    await new Promise((r) => setTimeout(r, 100));
    const quiet = await pool.run({ kind: 'evaluate', sheet: sheet('x = 3 A') }, { tenant: 'quiet' });
    settled.push('quiet');
    expect(quiet.ok).toBe(true);
    const reasons = (await Promise.all(flood)).map((o) => (o.ok ? 'ok' : o.reason));
    // The quiet tenant was served while the flood ran: before any of the flood's evaluations reached its deadline.
    expect(settled.indexOf('quiet')).toBeLessThan(settled.indexOf('timeout'));
    // The flooder holds at most its four places: the others are told at once that it is busy; nothing of it ran on.
    expect(reasons.filter((r) => r === 'busy').length).toBeGreaterThanOrEqual(2);
    expect(reasons.filter((r) => r !== 'busy').every((r) => r === 'timeout')).toBe(true);
  }, 20_000);

  it('holds places by reservation, gives them back, and refuses a tenant whose places are all held', async () => {
    const held = Array.from({ length: 4 }, () => pool.reserve('r'));
    expect(held.every(Boolean)).toBe(true);
    expect(pool.reserve('r')).toBeUndefined();
    expect(await pool.run({ kind: 'evaluate', sheet: sheet('x = 1') }, { tenant: 'r' })).toMatchObject({ ok: false, reason: 'busy' });
    const used = await pool.run({ kind: 'evaluate', sheet: sheet('x = 1') }, { tenant: 'r', reservation: held[0] });
    expect(used.ok).toBe(true);
    for (const r of held) r?.release();
    expect(pool.reserve('r')).toBeDefined();
  });

  it('answers the work it has not done, running or waiting, with "shutdown" when closed, and any work asked after', async () => {
    const own = new EvaluationPool({ processes: 1, timeoutMs: 5000, waitMs: 5000, memoryMb: 128, perTenantRunning: 1, perTenantQueued: 4 });
    await own.ready();
    const running = own.run({ kind: 'evaluate', sheet: RUNAWAY }, { tenant: 'a' });
    const waiting = own.run({ kind: 'evaluate', sheet: sheet('x = 1') }, { tenant: 'a' });
    await new Promise((r) => setTimeout(r, 200));
    await own.close();
    expect(await running).toMatchObject({ ok: false, reason: 'shutdown' });
    expect(await waiting).toMatchObject({ ok: false, reason: 'shutdown' });
    expect(await own.run({ kind: 'evaluate', sheet: sheet('x = 1') }, { tenant: 'a' })).toMatchObject({ ok: false, reason: 'shutdown' });
  });
});
