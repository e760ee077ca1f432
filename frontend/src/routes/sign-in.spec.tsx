import { describe, expect, it } from 'vitest';
import { safeNext } from './sign-in';

describe('safeNext', () => {
  it('follows only paths of this app after sign-in', () => {
    expect(safeNext('/projects/p1')).toBe('/projects/p1');
    expect(safeNext('//evil.example/x')).toBe('/projects');
    expect(safeNext('https://evil.example')).toBe('/projects');
    expect(safeNext(null)).toBe('/projects');
  });
});
