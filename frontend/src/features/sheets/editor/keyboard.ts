/**
 * The sheet's keys, in one table: the code editor binds them (CodeMirror key names), the cell binds them
 * when focus is elsewhere in it, and the keyboard help lists them. Saving and evaluating stay automatic;
 * the keys only do sooner, or without the mouse, what the buttons do. Our own set: Ctrl (⌘ on a Mac) with
 * the arrows walks the sheet, with Shift moves the cell, Ctrl+S saves now as everywhere.
 */
export type SheetCommand = 'saveNow' | 'nextCell' | 'previousCell' | 'moveDown' | 'moveUp' | 'newCalcBelow' | 'keysHelp';

export interface KeyBinding {
  command: SheetCommand;
  /** CodeMirror's name for the key ("Mod" is Ctrl, or ⌘ on a Mac). */
  key: string;
  /** What the key does, as the help says it. */
  does: string;
}

export const KEYBOARD: readonly KeyBinding[] = [
  { command: 'saveNow', key: 'Mod-s', does: 'Save and evaluate this cell now (it also happens by itself a moment after you stop typing)' },
  { command: 'nextCell', key: 'Mod-ArrowDown', does: 'Go to the next cell' },
  { command: 'previousCell', key: 'Mod-ArrowUp', does: 'Go to the previous cell' },
  { command: 'moveDown', key: 'Mod-Shift-ArrowDown', does: 'Move this cell down' },
  { command: 'moveUp', key: 'Mod-Shift-ArrowUp', does: 'Move this cell up' },
  { command: 'newCalcBelow', key: 'Mod-Shift-Space', does: 'Start a new calc cell below this one' },
  { command: 'keysHelp', key: 'F1', does: 'Show these keys (also ? when not typing in a cell)' },
];

/** The keys of a table's grid (components/table-grid.tsx), as the keyboard help lists them. */
export const TABLE_KEYS: readonly { keys: string; does: string }[] = [
  { keys: '←  →  ↑  ↓', does: 'Move in the table (with Shift: select a block)' },
  { keys: 'Home / End', does: 'First or last column; with Ctrl, first or last row' },
  { keys: 'Page Up / Page Down', does: 'A screen of rows up or down' },
  { keys: 'Enter or F2', does: 'Edit the value (or just start typing); Enter again keeps it and goes down, Tab goes right, Esc leaves it as it was' },
  { keys: 'Delete', does: 'Empty the selected values' },
  { keys: 'Ctrl+C / Ctrl+V', does: 'Copy the selection; paste a block copied from a spreadsheet at the selection' },
];

const isMac = () => typeof navigator !== 'undefined' && /Mac|iPhone|iPad/.test(navigator.platform);

/** A key as a person reads it on this computer: "Ctrl+Shift+↓", or "⌘+Shift+↓" on a Mac. */
export function keyLabel(key: string, mac = isMac()): string {
  const names: Record<string, string> = { Mod: mac ? '⌘' : 'Ctrl', ArrowDown: '↓', ArrowUp: '↑', Space: 'Space', s: 'S' };
  return key
    .split('-')
    .map((part) => names[part] ?? part)
    .join('+');
}

/** The command a key press stands for (for key presses outside the code editor), or undefined. */
export function commandOf(e: Pick<KeyboardEvent, 'key' | 'ctrlKey' | 'metaKey' | 'shiftKey' | 'altKey'>, mac = isMac()): SheetCommand | undefined {
  const mod = mac ? e.metaKey : e.ctrlKey;
  const parts = [...(mod ? ['Mod'] : []), ...(e.altKey ? ['Alt'] : []), ...(e.shiftKey ? ['Shift'] : [])];
  const key = e.key === ' ' ? 'Space' : e.key.length === 1 ? e.key.toLowerCase() : e.key;
  const name = [...parts, key].join('-');
  return KEYBOARD.find((k) => k.key === name)?.command;
}
