import katex from 'katex';
// KaTeX's stylesheet and fonts come with the pages that draw formulas, not with the first page.
import 'katex/dist/katex.min.css';
import { useMemo } from 'react';

/**
 * KaTeX's options for LaTeX that may come from a user (notes): no links or HTML (trust off), no rule or
 * space larger than 20 em, and a bound on macro expansion, so no formula can cover the screen or loop.
 */
export const KATEX_OPTIONS = { throwOnError: false, strict: 'ignore', output: 'htmlAndMathml', trust: false, maxSize: 20, maxExpand: 200 } as const;

/** LaTeX typeset with KaTeX (the same LaTeX the server gives for the PDF). Bad LaTeX shows as source, in red. */
export function Tex({ children, display = false }: { children: string; display?: boolean }) {
  const html = useMemo(() => katex.renderToString(children, { ...KATEX_OPTIONS, displayMode: display }), [children, display]);
  return <span className="aw-tex" dangerouslySetInnerHTML={{ __html: html }} />;
}
