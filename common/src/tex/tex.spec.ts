import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import type { CalcResult } from '../cells/types';
import { displayTex, textTex } from './tex';

const texOf = (source: string) => {
  const cell = evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult;
  expect(cell.errors).toEqual([]);
  return cell.lines.map((l) => ('tex' in l && l.tex ? [l.tex.formula, l.tex.working, l.tex.result] : [])).flat();
};

/** What KaTeX makes of a formula (its HTML), with the options the app uses, trust off. */
const rendered = (tex: string) => katex.renderToString(tex, { throwOnError: false, strict: 'ignore', trust: false, maxSize: 20, maxExpand: 200 });

describe('LaTeX from user text is inert', () => {
  it('escapes a string constant so it cannot become a command', () => {
    const all = texOf('x = "\\\\href{https://evil.example/login}{see datasheet}"\ny = "\\\\rule{5000em}{5000em}"\nz = x');
    for (const tex of all) {
      expect(tex).not.toMatch(/\\href|\\rule/);
      const html = rendered(tex);
      expect(html).not.toMatch(/<a |href=/);
      expect(html).not.toMatch(/(height|width|border[a-z-]*):\s*[1-9]\d{2,}(\.\d+)?em/);
    }
    // The text itself is still shown, character for character.
    expect(rendered(all[0])).toContain('https://evil.example/login');
  });

  it('escapes every LaTeX special character in text and in displays', () => {
    expect(textTex('a_b $5 {c} 50% #1 & \\x ^ ~')).toBe('\\text{a\\_b \\$5 \\{c\\} 50\\% \\#1 \\& }\\backslash \\text{x }\\hat{}\\text{ }\\sim ');
    expect(displayTex('\\href{x}{y}')).toBe('\\backslash href\\{x\\}\\{y\\}');
    expect(rendered(displayTex('\\def\\a{\\a\\a}\\a'))).not.toMatch(/katex-error/);
  });
});
