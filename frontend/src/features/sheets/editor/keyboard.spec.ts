import { describe, expect, it } from 'vitest';
import { commandOf, keyLabel, KEYBOARD } from './keyboard';

const press = (key: string, mods: Partial<Record<'ctrlKey' | 'metaKey' | 'shiftKey' | 'altKey', boolean>> = {}) => ({
  key,
  ctrlKey: false,
  metaKey: false,
  shiftKey: false,
  altKey: false,
  ...mods,
});

describe('the sheet keys', () => {
  it('maps key presses to their commands, with Ctrl on Linux and Windows and ⌘ on a Mac', () => {
    expect(commandOf(press('s', { ctrlKey: true }), false)).toBe('saveNow');
    expect(commandOf(press('S', { metaKey: true }), true)).toBe('saveNow');
    expect(commandOf(press('ArrowDown', { ctrlKey: true }), false)).toBe('nextCell');
    expect(commandOf(press('ArrowUp', { ctrlKey: true, shiftKey: true }), false)).toBe('moveUp');
    expect(commandOf(press(' ', { ctrlKey: true, shiftKey: true }), false)).toBe('newCalcBelow');
    expect(commandOf(press('F1'), false)).toBe('keysHelp');
  });

  it('leaves other presses alone: the other modifier, plain typing, Alt with the arrows', () => {
    expect(commandOf(press('s', { metaKey: true }), false)).toBeUndefined();
    expect(commandOf(press('s'), false)).toBeUndefined();
    expect(commandOf(press('ArrowDown', { altKey: true }), false)).toBeUndefined();
    expect(commandOf(press('Enter', { ctrlKey: true }), false)).toBeUndefined();
  });

  it('labels keys as people read them, and gives every command one key', () => {
    expect(keyLabel('Mod-Shift-ArrowDown', false)).toBe('Ctrl+Shift+↓');
    expect(keyLabel('Mod-s', true)).toBe('⌘+S');
    expect(new Set(KEYBOARD.map((k) => k.command)).size).toBe(KEYBOARD.length);
    expect(new Set(KEYBOARD.map((k) => k.key)).size).toBe(KEYBOARD.length);
  });
});
