/**
 * Cells that cannot change, so what is read from their content can be kept with them. A caller that keeps a
 * sheet between evaluations (the server's evaluation processes keep the sheets they evaluated, and a one-cell
 * edit replaces one cell of a kept sheet) seals its cells: a sealed cell is deep-frozen, and its JSON — the
 * evaluation cache's key and the sheet's fingerprint are made of it — is written once, not at every edit of
 * another cell (three tables of 200 000 values took some 20 ms to write at every edit).
 * An unsealed cell is written afresh every time, so a caller that never seals sees no difference.
 */
import type { Cell } from './sheet-format';

/** Sealed cells, with their JSON once it has been written. */
const sealed = new WeakMap<Cell, string | undefined>();

/** Freezes a cell and everything in it (a cell is plain data: objects, arrays, strings, numbers, null). */
export function sealCell(cell: Cell): Cell {
  if (sealed.has(cell)) return cell;
  const stack: object[] = [cell];
  while (stack.length) {
    const value = stack.pop()!;
    if (Object.isFrozen(value)) continue;
    Object.freeze(value);
    for (const child of Object.values(value)) if (child !== null && typeof child === 'object') stack.push(child);
  }
  sealed.set(cell, undefined);
  return cell;
}

export const isSealed = (cell: Cell): boolean => sealed.has(cell);

/** JSON.stringify(cell), written once for a sealed cell. */
export function cellJson(cell: Cell): string {
  if (!sealed.has(cell)) return JSON.stringify(cell);
  let json = sealed.get(cell);
  if (json === undefined) {
    json = JSON.stringify(cell);
    sealed.set(cell, json);
  }
  return json;
}
