/**
 * Notes are Markdown (CommonMark, parsed by markdown-it) with maths between dollars: `$X_L$` inline,
 * `$$ … $$` on lines of its own for display. The parse gives a small document model that the screen
 * (KaTeX) and the signed package (MathJax to vector paths) both draw, so the two cannot drift.
 * Raw HTML is not read, and a link is kept as its text with its address, never as something to follow.
 */
import MarkdownIt from 'markdown-it';
import type StateBlock from 'markdown-it/lib/rules_block/state_block.mjs';
import type StateInline from 'markdown-it/lib/rules_inline/state_inline.mjs';
import type Token from 'markdown-it/lib/token.mjs';

export type NoteInline =
  | { kind: 'text'; text: string; strong?: boolean; emphasis?: boolean; code?: boolean }
  | { kind: 'maths'; tex: string; display?: boolean }
  | { kind: 'link'; text: string; address: string }
  | { kind: 'break' };

export type NoteBlock =
  | { kind: 'heading'; level: number; inlines: NoteInline[] }
  | { kind: 'paragraph'; inlines: NoteInline[]; quote?: boolean }
  | { kind: 'list'; ordered: boolean; start: number; items: NoteInline[][] }
  | { kind: 'maths'; tex: string }
  | { kind: 'code'; text: string }
  | { kind: 'rule' };

const DOLLAR = 0x24;
const BACKSLASH = 0x5c;
const isSpace = (c: number) => c === 0x20 || c === 0x09 || c === 0x0a;
const isDigit = (c: number) => c >= 0x30 && c <= 0x39;

/**
 * `$…$` inline (pandoc's rule: no space just inside the dollars, no digit just after the closing one,
 * so "costs $5 and $6" stays text) and `$$…$$` inline as display maths.
 */
function inlineMaths(state: StateInline, silent: boolean): boolean {
  const { src, pos, posMax } = state;
  if (src.charCodeAt(pos) !== DOLLAR) return false;
  const display = src.charCodeAt(pos + 1) === DOLLAR;
  const open = display ? 2 : 1;
  const start = pos + open;
  if (start >= posMax || isSpace(src.charCodeAt(start))) return false;
  let end = start;
  while (end < posMax) {
    const c = src.charCodeAt(end);
    if (c === BACKSLASH) {
      end += 2;
      continue;
    }
    if (c === DOLLAR && (!display || src.charCodeAt(end + 1) === DOLLAR)) break;
    end++;
  }
  if (end >= posMax || end === start || isSpace(src.charCodeAt(end - 1))) return false;
  if (!display && isDigit(src.charCodeAt(end + 1))) return false;
  if (!silent) {
    const token = state.push('math_inline', 'math', 0);
    token.content = src.slice(start, end);
    token.markup = display ? '$$' : '$';
  }
  state.pos = end + open;
  return true;
}

/** `$$` at the start of a line opens display maths, which runs to the line that ends with `$$`. */
function blockMaths(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  const lineText = (line: number) => state.src.slice(state.bMarks[line] + state.tShift[line], state.eMarks[line]);
  const first = lineText(startLine);
  if (!first.startsWith('$$') || state.sCount[startLine] - state.blkIndent >= 4) return false;
  if (silent) return true;
  let body = first.slice(2);
  let line = startLine;
  let closed = body.trimEnd().endsWith('$$');
  if (closed) body = body.trimEnd().slice(0, -2);
  const parts = [body];
  while (!closed && ++line < endLine) {
    let text = lineText(line);
    if (text.trimEnd().endsWith('$$')) {
      text = text.trimEnd().slice(0, -2);
      closed = true;
    }
    parts.push(text);
  }
  state.line = Math.min(line, endLine - 1) + 1;
  const token = state.push('math_block', 'math', 0);
  token.block = true;
  token.content = parts.join('\n').trim();
  token.map = [startLine, state.line];
  token.markup = '$$';
  return true;
}

const md = new MarkdownIt('commonmark', { html: false, linkify: false, typographer: false });
md.inline.ruler.after('escape', 'math_inline', inlineMaths);
md.block.ruler.before('fence', 'math_block', blockMaths, { alt: ['paragraph', 'reference', 'blockquote', 'list'] });

/**
 * Formulas typeset in one note; past this, formulas are shown as their LaTeX source, so a hostile note
 * cannot make the screen or the package typeset without bound (each formula costs about a millisecond).
 */
export const MAX_NOTE_MATHS = 500;

/** The inline children of one block, as runs with their emphasis; `budget` counts the formulas left. */
function inlinesOf(tokens: Token[] | null, budget: { maths: number }): NoteInline[] {
  const out: NoteInline[] = [];
  let strong = 0;
  let emphasis = 0;
  let link: { address: string; text: string } | undefined;
  const text = (t: string, code = false) => {
    if (link) link.text += t;
    else if (t)
      out.push({ kind: 'text', text: t, ...(strong ? { strong: true } : {}), ...(emphasis ? { emphasis: true } : {}), ...(code ? { code: true } : {}) });
  };
  for (const t of tokens ?? []) {
    switch (t.type) {
      case 'text':
        text(t.content);
        break;
      case 'code_inline':
        text(t.content, true);
        break;
      case 'softbreak':
        text(' ');
        break;
      case 'hardbreak':
        out.push({ kind: 'break' });
        break;
      case 'strong_open':
        strong++;
        break;
      case 'strong_close':
        strong--;
        break;
      case 'em_open':
        emphasis++;
        break;
      case 'em_close':
        emphasis--;
        break;
      case 'link_open':
        link = { address: t.attrGet('href') ?? '', text: '' };
        break;
      case 'link_close':
        if (link) out.push({ kind: 'link', text: link.text, address: link.address });
        link = undefined;
        break;
      case 'image':
        text(`[image: ${t.content}] (${t.attrGet('src') ?? ''})`);
        break;
      case 'math_inline':
        if (link) link.text += t.content;
        else if (budget.maths-- > 0) out.push({ kind: 'maths', tex: t.content, ...(t.markup === '$$' ? { display: true } : {}) });
        else text(`${t.markup}${t.content}${t.markup}`, true);
        break;
      default:
        text(t.content ?? '');
    }
  }
  return out;
}

/** A note's Markdown as blocks of inline runs and maths. */
export function parseNote(source: string): NoteBlock[] {
  const tokens = md.parse(source, {});
  const blocks: NoteBlock[] = [];
  let list: Extract<NoteBlock, { kind: 'list' }> | undefined;
  let quote = 0;
  let item: NoteInline[] | undefined;
  const budget = { maths: MAX_NOTE_MATHS };
  for (let k = 0; k < tokens.length; k++) {
    const t = tokens[k];
    switch (t.type) {
      case 'heading_open':
        blocks.push({ kind: 'heading', level: Number(t.tag.slice(1)), inlines: inlinesOf(tokens[k + 1].children, budget) });
        k += 2;
        break;
      case 'paragraph_open': {
        const inlines = inlinesOf(tokens[k + 1].children, budget);
        if (item) item.push(...(item.length ? [{ kind: 'break' } as const] : []), ...inlines);
        else blocks.push({ kind: 'paragraph', inlines, ...(quote ? { quote: true } : {}) });
        k += 2;
        break;
      }
      case 'bullet_list_open':
      case 'ordered_list_open':
        if (!list) {
          list = { kind: 'list', ordered: t.type === 'ordered_list_open', start: Number(t.attrGet('start') ?? 1), items: [] };
          blocks.push(list);
        }
        break;
      case 'bullet_list_close':
      case 'ordered_list_close':
        if (t.level === 0 || (quote && t.level === 1)) list = undefined;
        break;
      case 'list_item_open':
        item = [];
        list?.items.push(item);
        break;
      case 'list_item_close':
        item = undefined;
        break;
      case 'blockquote_open':
        quote++;
        break;
      case 'blockquote_close':
        quote--;
        break;
      case 'math_block':
        blocks.push(budget.maths-- > 0 ? { kind: 'maths', tex: t.content } : { kind: 'code', text: `$$\n${t.content}\n$$` });
        break;
      case 'fence':
      case 'code_block':
        blocks.push({ kind: 'code', text: t.content.replace(/\n$/, '') });
        break;
      case 'hr':
        blocks.push({ kind: 'rule' });
        break;
      default:
        break;
    }
  }
  return blocks;
}

/** A link as it is shown: its text, then its address (the two once if they are the same). */
export function linkText(link: { text: string; address: string }): string {
  return !link.text || link.text === link.address ? link.address : `${link.text} (${link.address})`;
}
