import katex from 'katex';
// KaTeX's stylesheet and fonts come with the pages that draw formulas, not with the first page.
import 'katex/dist/katex.min.css';
import { useMemo } from 'react';

/**
 * KaTeX's options for LaTeX that may come from a user (notes): no links or HTML (trust off), no rule or
 * space larger than 20 em, and a bound on macro expansion, so no formula can cover the screen or loop.
 */
export const KATEX_OPTIONS = { throwOnError: false, strict: 'ignore', output: 'htmlAndMathml', trust: false, maxSize: 20, maxExpand: 200 } as const;

/**
 * Typeset formulas by their LaTeX, the most recently used kept: a sheet shows the same formula again after
 * every save (the stored result after its preview, a cell drawn again), and KaTeX is the dearest part of
 * drawing a cell.
 */
const typeset = new Map<string, string>();
const TYPESET_KEPT = 5000;

function toHtml(tex: string, display: boolean): string {
  const key = `${display ? 'd' : 'i'}${tex}`;
  let html = typeset.get(key);
  if (html === undefined) {
    html = katex.renderToString(tex, { ...KATEX_OPTIONS, displayMode: display });
    if (typeset.size >= TYPESET_KEPT) typeset.delete(typeset.keys().next().value as string);
  } else typeset.delete(key);
  typeset.set(key, html);
  return html;
}

/** LaTeX typeset with KaTeX (the same LaTeX the server gives for the PDF). Bad LaTeX shows as source, in red. */
export function Tex({ children, display = false }: { children: string; display?: boolean }) {
  const html = useMemo(() => toHtml(children, display), [children, display]);
  return <span className="aw-tex" dangerouslySetInnerHTML={{ __html: html }} />;
}
