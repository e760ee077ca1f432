import { describe, expect, it } from 'vitest';
import { linkText, MAX_NOTE_MATHS, parseNote } from './markdown';

describe('notes as Markdown with maths (markdown-it 14.3.3, CommonMark)', () => {
  it('reads inline and display maths between dollars, and leaves prices alone (pandoc rule, from memory)', () => {
    const [p, display] = parseNote('Ohm: $I = \\frac{V}{R}$ costs $5 and $6.\n\n$$\nZ = \\sqrt{R^2 + X^2}\n$$');
    expect(p).toEqual({
      kind: 'paragraph',
      inlines: [
        { kind: 'text', text: 'Ohm: ' },
        { kind: 'maths', tex: 'I = \\frac{V}{R}' },
        { kind: 'text', text: ' costs $5 and $6.' },
      ],
    });
    expect(display).toEqual({ kind: 'maths', tex: 'Z = \\sqrt{R^2 + X^2}' });
  });

  it('reads headings, emphasis, lists, quotes, code and rules (CommonMark 0.31, sections 4 and 6)', () => {
    const blocks = parseNote('# Title $X_L$\n\nSome **bold**, *italic* and `code`.\n\n1. one\n2. two\n\n- a\n- b\n\n> quoted\n\n    indented code\n\n---');
    expect(blocks.map((b) => b.kind)).toEqual(['heading', 'paragraph', 'list', 'list', 'paragraph', 'code', 'rule']);
    expect(blocks[0]).toEqual({
      kind: 'heading',
      level: 1,
      inlines: [
        { kind: 'text', text: 'Title ' },
        { kind: 'maths', tex: 'X_L' },
      ],
    });
    expect(blocks[1]).toMatchObject({
      inlines: [
        { text: 'Some ' },
        { text: 'bold', strong: true },
        { text: ', ' },
        { text: 'italic', emphasis: true },
        { text: ' and ' },
        { text: 'code', code: true },
        { text: '.' },
      ],
    });
    expect(blocks[2]).toMatchObject({ ordered: true, start: 1, items: [[{ text: 'one' }], [{ text: 'two' }]] });
    expect(blocks[3]).toMatchObject({ ordered: false, items: [[{ text: 'a' }], [{ text: 'b' }]] });
    expect(blocks[4]).toMatchObject({ quote: true, inlines: [{ text: 'quoted' }] });
  });

  it('keeps a link as text with its address and reads no raw HTML', () => {
    const [p] = parseNote('See [the datasheet](https://example.com/ds.pdf) and <a href="javascript:alert(1)">x</a>.');
    const link = p.kind === 'paragraph' ? p.inlines.find((r) => r.kind === 'link') : undefined;
    expect(link).toEqual({ kind: 'link', text: 'the datasheet', address: 'https://example.com/ds.pdf' });
    expect(linkText(link as { text: string; address: string })).toBe('the datasheet (https://example.com/ds.pdf)');
    expect(
      p.kind === 'paragraph' &&
        p.inlines
          .filter((r) => r.kind === 'text')
          .map((r) => (r as { text: string }).text)
          .join(''),
    ).toContain('<a href="javascript:alert(1)">x</a>');
  });

  it('keeps an escaped dollar as a dollar', () => {
    expect(parseNote('A \\$5 fee and $x$.')[0]).toMatchObject({ inlines: [{ text: 'A $5 fee and ' }, { kind: 'maths', tex: 'x' }, { text: '.' }] });
  });

  it('typesets at most MAX_NOTE_MATHS formulas in a note and shows the rest as their source', () => {
    const [p] = parseNote(Array.from({ length: MAX_NOTE_MATHS + 3 }, (_, k) => `$x_${k}$`).join(' '));
    const inlines = p.kind === 'paragraph' ? p.inlines : [];
    expect(inlines.filter((r) => r.kind === 'maths')).toHaveLength(MAX_NOTE_MATHS);
    expect(inlines.at(-1)).toEqual({ kind: 'text', text: `$x_${MAX_NOTE_MATHS + 2}$`, code: true });
  });
});
