import katex from 'katex';
import { useMemo } from 'react';

/** LaTeX typeset with KaTeX (the same LaTeX the server gives for the PDF). Bad LaTeX shows as source, in red. */
export function Tex({ children, display = false }: { children: string; display?: boolean }) {
  const html = useMemo(() => katex.renderToString(children, { throwOnError: false, displayMode: display, strict: 'ignore', output: 'htmlAndMathml' }), [children, display]);
  return <span className="aw-tex" dangerouslySetInnerHTML={{ __html: html }} />;
}

/** Text with $inline maths$: the maths typeset, the rest as it is. */
export function TextWithMaths({ text }: { text: string }) {
  const parts = text.split(/(\$[^$]+\$)/g);
  return <>{parts.map((p, i) => (p.startsWith('$') && p.endsWith('$') && p.length > 2 ? <Tex key={i}>{p.slice(1, -1)}</Tex> : <span key={i}>{p}</span>))}</>;
}
