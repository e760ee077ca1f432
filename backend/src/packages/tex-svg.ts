/**
 * LaTeX to SVG with MathJax (the same LaTeX the screen typesets with KaTeX), for drawing formulas into
 * the PDF as vectors. MathJax sizes its SVG in ex; we convert to points for a given font size.
 */
import { liteAdaptor } from 'mathjax-full/js/adaptors/liteAdaptor.js';
import { RegisterHTMLHandler } from 'mathjax-full/js/handlers/html.js';
import { TeX } from 'mathjax-full/js/input/tex.js';
import { AllPackages } from 'mathjax-full/js/input/tex/AllPackages.js';
import { mathjax } from 'mathjax-full/js/mathjax.js';
import { SVG } from 'mathjax-full/js/output/svg.js';

const adaptor = liteAdaptor();
RegisterHTMLHandler(adaptor);
const doc = mathjax.document('', { InputJax: new TeX({ packages: AllPackages.filter((p: string) => p !== 'bussproofs') }), OutputJax: new SVG({ fontCache: 'none' }) });

/** The x-height of MathJax's TeX fonts, as a fraction of the font size. */
const EX_PER_EM = 0.431;

export interface TexSvg {
  svg: string;
  /** Size in points at the requested font size. */
  width: number;
  height: number;
  /** How far the baseline is above the bottom, in points. */
  depth: number;
}

const cache = new Map<string, TexSvg>();

/** Converted once per formula and size (a layout asks for a formula's size before drawing it). */
export function texToSvg(tex: string, fontSize: number): TexSvg {
  const key = `${fontSize}|${tex}`;
  let hit = cache.get(key);
  if (!hit) {
    if (cache.size > 5000) cache.clear();
    hit = convert(tex, fontSize);
    cache.set(key, hit);
  }
  return hit;
}

function convert(tex: string, fontSize: number): TexSvg {
  const node = doc.convert(`\\displaystyle ${tex}`, { display: false });
  const svgNode = adaptor.firstChild(node) as unknown as Parameters<typeof adaptor.outerHTML>[0];
  const svg = adaptor.outerHTML(svgNode);
  const ex = fontSize * EX_PER_EM;
  const width = parseFloat(adaptor.getAttribute(svgNode, 'width')) * ex;
  const height = parseFloat(adaptor.getAttribute(svgNode, 'height')) * ex;
  const align = /vertical-align:\s*(-?[\d.]+)ex/.exec(adaptor.getAttribute(svgNode, 'style') ?? '');
  // Sizes in points, so the PDF drawing needs no notion of ex.
  const sized = svg.replace(/^<svg([^>]*?) width="[^"]*" height="[^"]*"/, `<svg$1 width="${width.toFixed(2)}" height="${height.toFixed(2)}"`).replace(/ style="vertical-align:[^"]*"/, '');
  return { svg: sized, width, height, depth: align ? -parseFloat(align[1]) * ex : 0 };
}
