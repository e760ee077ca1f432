/**
 * The calc language for CodeMirror: highlighting (numbers, names, units and functions we know,
 * `to`, comments), completion of names in scope, functions, units and constants, and the server's
 * errors shown as underlines at their line and column.
 */
import { autocompletion, type Completion, type CompletionContext, type CompletionResult } from '@codemirror/autocomplete';
import { HighlightStyle, StreamLanguage, syntaxHighlighting } from '@codemirror/language';
import type { Diagnostic as CmDiagnostic } from '@codemirror/lint';
import type { Text } from '@codemirror/state';
import { tags } from '@lezer/highlight';
import type { Diagnostic } from '@ampwright/common';
import { LANGUAGE_CONSTANTS, LANGUAGE_FUNCTIONS, LANGUAGE_KEYWORDS, LANGUAGE_UNITS, namesDefinedIn } from '@ampwright/common/language/vocabulary';
import { palette } from '../../../app/theme';
import { PALETTE } from '@ampwright/common/plot/palette';

const FUNCTIONS = new Set(LANGUAGE_FUNCTIONS.map((f) => f.label));
const UNITS = new Set(LANGUAGE_UNITS.map((u) => u.label));

export const calcLanguage = StreamLanguage.define<{ afterNumber: boolean }>({
  name: 'ampwright-calc',
  startState: () => ({ afterNumber: false }),
  token(stream, state) {
    if (stream.eatSpace()) return null;
    if (stream.match('#')) {
      stream.skipToEnd();
      return 'comment';
    }
    if (stream.match(/^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?/)) {
      state.afterNumber = true;
      return 'number';
    }
    const word = stream.match(/^[A-Za-z_µΩ][A-Za-z0-9_]*/) as RegExpMatchArray | null;
    if (word) {
      const w = word[0];
      const wasAfterNumber = state.afterNumber;
      state.afterNumber = false;
      if (LANGUAGE_KEYWORDS.includes(w)) return 'keyword';
      if (FUNCTIONS.has(w) && stream.peek() === '(') return 'function';
      if (wasAfterNumber || UNITS.has(w)) return UNITS.has(w) || wasAfterNumber ? 'unit' : 'variableName';
      return 'variableName';
    }
    state.afterNumber = false;
    if (stream.match(/^(==|<=|>=|!=|[-+*/^=<>(),;:[\]'])/)) return 'operator';
    stream.next();
    return null;
  },
  tokenTable: { unit: tags.unit, function: tags.function(tags.variableName) },
});

export const calcHighlighting = syntaxHighlighting(
  HighlightStyle.define([
    { tag: tags.comment, color: '#6b6f5a', fontStyle: 'italic' },
    { tag: tags.number, color: palette.copper },
    { tag: tags.unit, color: PALETTE.pass },
    { tag: tags.keyword, color: palette.ink, fontWeight: '600' },
    { tag: tags.function(tags.variableName), color: '#5b3a8a' },
    { tag: tags.variableName, color: palette.ink },
    { tag: tags.operator, color: '#4f5a62' },
  ]),
);

const toOptions = (entries: { label: string; detail: string }[], type: string, boost = 0): Completion[] =>
  entries.map((e) => ({ label: e.label, detail: e.detail, type, boost }));
const FUNCTION_OPTIONS = toOptions(LANGUAGE_FUNCTIONS, 'function');
const CONSTANT_OPTIONS = toOptions(LANGUAGE_CONSTANTS, 'constant');
const KEYWORD_OPTIONS = LANGUAGE_KEYWORDS.map((k) => ({ label: k, type: 'keyword', detail: 'convert the result, e.g. to mA' }));

/** Completion of the names in scope (from the cells above and the lines above), functions, units and constants. */
export function calcCompletion(scopeNames: () => { label: string; detail?: string }[]) {
  return autocompletion({
    activateOnTyping: true,
    override: [
      (context: CompletionContext): CompletionResult | null => {
        const word = context.matchBefore(/[A-Za-z_][A-Za-z0-9_]*/);
        if (!word || (word.from === word.to && !context.explicit)) return null;
        const before = context.state.sliceDoc(Math.max(0, word.from - 24), word.from);
        if (/#[^\n]*$/.test(before)) return null;
        const unitLikely = /(\d|\))\s*$/.test(before) || /\bto\s+$/.test(before);
        const here = namesDefinedIn(context.state.doc.toString()).map((label) => ({ label, detail: 'this cell' }));
        const seen = new Set<string>();
        const scope = [...here, ...scopeNames()]
          .filter((n) => !seen.has(n.label) && seen.add(n.label))
          .map((n) => ({ label: n.label, detail: n.detail ?? 'in scope', type: 'variable', boost: unitLikely ? 0 : 2 }));
        const units = toOptions(LANGUAGE_UNITS, 'unit', unitLikely ? 3 : -1);
        return { from: word.from, options: [...scope, ...units, ...FUNCTION_OPTIONS, ...CONSTANT_OPTIONS, ...KEYWORD_OPTIONS], validFor: /^[A-Za-z0-9_]*$/ };
      },
    ],
  });
}

/** The server's diagnostics (1-based line and column) as CodeMirror ranges: from the column to the end of the word there. */
export function toCmDiagnostics(doc: Text, diagnostics: Diagnostic[], severity: 'error' | 'warning'): CmDiagnostic[] {
  return diagnostics.flatMap((d) => {
    if (d.line < 1 || d.line > doc.lines) return [];
    const line = doc.line(d.line);
    const from = Math.min(line.from + Math.max(0, d.column - 1), line.to);
    const rest = line.text.slice(from - line.from);
    const token = /^[A-Za-z0-9_.]+/.exec(rest)?.[0].length ?? (rest.length ? 1 : 0);
    const to = Math.max(from + token, from === line.to ? from : from + 1);
    return [{ from: from === to && from > line.from ? from - 1 : from, to, severity, message: d.message }];
  });
}
