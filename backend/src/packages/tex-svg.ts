/**
 * LaTeX to SVG with MathJax (the same LaTeX the screen typesets with KaTeX), for drawing formulas into
 * the PDF as vectors. MathJax sizes its SVG in ex; we convert to points for a given font size.
 */
import { liteAdaptor } from 'mathjax-full/js/adaptors/liteAdaptor.js';
import { RegisterHTMLHandler } from 'mathjax-full/js/handlers/html.js';
import { TeX } from 'mathjax-full/js/input/tex.js';
import 'mathjax-full/js/input/tex/base/BaseConfiguration.js';
import 'mathjax-full/js/input/tex/ams/AmsConfiguration.js';
import 'mathjax-full/js/input/tex/boldsymbol/BoldsymbolConfiguration.js';
import 'mathjax-full/js/input/tex/cancel/CancelConfiguration.js';
import 'mathjax-full/js/input/tex/color/ColorConfiguration.js';
import 'mathjax-full/js/input/tex/gensymb/GensymbConfiguration.js';
import 'mathjax-full/js/input/tex/noundefined/NoUndefinedConfiguration.js';
import 'mathjax-full/js/input/tex/textmacros/TextMacrosConfiguration.js';
import 'mathjax-full/js/input/tex/upgreek/UpgreekConfiguration.js';
import { mathjax } from 'mathjax-full/js/mathjax.js';
import { SVG } from 'mathjax-full/js/output/svg.js';

const adaptor = liteAdaptor();
RegisterHTMLHandler(adaptor);
/**
 * Only packages that typeset: none that makes links or HTML (html: \href, \class, \style), loads code
 * (require, autoload), defines macros (newcommand, configmacros) or acts on the reader (action). An
 * unknown command is shown in red (noundefined), never fetched.
 */
export const TEX_PACKAGES = ['base', 'ams', 'boldsymbol', 'cancel', 'color', 'gensymb', 'noundefined', 'textmacros', 'upgreek'];
const doc = mathjax.document('', {
  InputJax: new TeX({ packages: TEX_PACKAGES, maxMacros: 1000, maxBuffer: 64 * 1024 }),
  OutputJax: new SVG({ fontCache: 'none' }),
});

/** The x-height of MathJax's TeX fonts, as a fraction of the font size. */
const EX_PER_EM = 0.431;

/** A MathJax drawing as pdfkit operations: groups with SVG transforms, glyph paths and rules. */
type DrawOp =
  | { op: 'group'; transform?: string; children: DrawOp[] }
  | { op: 'path'; d: string; transform?: string }
  | { op: 'rect'; x: number; y: number; w: number; h: number };

export interface TexSvg {
  svg: string;
  /**
   * The same drawing as operations for pdfkit, when it holds only groups, paths and rectangles with
   * translate and scale transforms (what MathJax writes for TeX); otherwise the SVG is drawn instead.
   */
  ops?: { viewBox: [number, number, number, number]; children: DrawOp[] };
  /** Size in points at the requested font size. */
  width: number;
  height: number;
  /** How far the baseline is above the bottom, in points. */
  depth: number;
}

const cache = new Map<string, TexSvg>();

/** Converted once per formula and size (a layout asks for a formula's size before drawing it). */
export function texToSvg(tex: string, fontSize: number, style: 'display' | 'text' = 'display'): TexSvg {
  const key = `${fontSize}|${style}|${tex}`;
  let hit = cache.get(key);
  if (!hit) {
    if (cache.size > 5000) cache.clear();
    hit = convert(tex, fontSize, style);
    cache.set(key, hit);
  }
  return hit;
}

function convert(tex: string, fontSize: number, style: 'display' | 'text'): TexSvg {
  const node = doc.convert(style === 'display' ? `\\displaystyle ${tex}` : tex, { display: false });
  const svgNode = adaptor.firstChild(node) as unknown as Parameters<typeof adaptor.outerHTML>[0];
  const svg = adaptor.outerHTML(svgNode);
  const ex = fontSize * EX_PER_EM;
  const width = parseFloat(adaptor.getAttribute(svgNode, 'width')) * ex;
  const height = parseFloat(adaptor.getAttribute(svgNode, 'height')) * ex;
  const align = /vertical-align:\s*(-?[\d.]+)ex/.exec(adaptor.getAttribute(svgNode, 'style') ?? '');
  // Sizes in points, so the PDF drawing needs no notion of ex.
  const sized = svg
    .replace(/^<svg([^>]*?) width="[^"]*" height="[^"]*"/, `<svg$1 width="${width.toFixed(2)}" height="${height.toFixed(2)}"`)
    .replace(/ style="vertical-align:[^"]*"/, '');
  return { svg: sized, ops: compile(svgNode), width, height, depth: align ? -parseFloat(align[1]) * ex : 0 };
}

type LiteNode = Parameters<typeof adaptor.outerHTML>[0];
const SIMPLE_TRANSFORM = /^\s*((translate|scale)\(\s*-?[\d.e+-]+(\s*[, ]\s*-?[\d.e+-]+)?\s*\)\s*)*$/;

function compile(svgNode: LiteNode): TexSvg['ops'] {
  const viewBox = (adaptor.getAttribute(svgNode, 'viewBox') ?? '')
    .trim()
    .split(/[\s,]+/)
    .map(Number) as number[];
  if (viewBox.length !== 4 || viewBox.some((n: number) => !Number.isFinite(n)) || viewBox[2] <= 0) return undefined;
  const children = compileChildren(svgNode);
  return children ? { viewBox: viewBox as [number, number, number, number], children } : undefined;
}

function compileChildren(node: LiteNode): DrawOp[] | undefined {
  const out: DrawOp[] = [];
  for (const child of adaptor.childNodes(node) as LiteNode[]) {
    const kind = adaptor.kind(child);
    if (kind === '#text' || kind === '#comment') continue;
    const transform = adaptor.getAttribute(child, 'transform') || undefined;
    if (transform && !SIMPLE_TRANSFORM.test(transform)) return undefined;
    if (kind === 'g') {
      const children = compileChildren(child);
      if (!children) return undefined;
      out.push({ op: 'group', transform, children });
    } else if (kind === 'path') {
      const raw = adaptor.getAttribute(child, 'd');
      const d = raw ? absolutePath(raw) : '';
      if (raw && !d) return undefined;
      if (d) out.push({ op: 'path', d, transform });
    } else if (kind === 'rect' && !transform) {
      const n = (a: string) => Number(adaptor.getAttribute(child, a) ?? 0);
      out.push({ op: 'rect', x: n('x'), y: n('y'), w: n('width'), h: n('height') });
    } else {
      return undefined;
    }
  }
  return out;
}

const ARITY: Record<string, number> = { M: 2, L: 2, H: 1, V: 1, C: 6, S: 4, Q: 4, T: 2, Z: 0 };
const normalised = new Map<string, string>();

/**
 * An SVG path as absolute M, L, C, Q and Z commands only, with the control points of the smooth
 * curves (S, T) written out: pdfkit's own path parser mis-reflects the control point of consecutive
 * T commands, which MathJax's glyphs are full of. '' for a path with arcs or anything unknown.
 */
export function absolutePath(d: string): string {
  const known = normalised.get(d);
  if (known !== undefined) return known;
  const tokens = d.match(/[a-zA-Z]|-?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g) ?? [];
  const out: string[] = [];
  let x = 0,
    y = 0,
    startX = 0,
    startY = 0;
  let lastCubic: [number, number] | null = null;
  let lastQuad: [number, number] | null = null;
  let command = '';
  let i = 0;
  const num = () => Number(tokens[i++]);
  const fmt = (...n: number[]) => n.map((v) => +v.toFixed(3)).join(' ');
  while (i < tokens.length) {
    if (/[a-zA-Z]/.test(tokens[i])) command = tokens[i++];
    const upper = command.toUpperCase();
    if (!(upper in ARITY)) return cache('');
    const rel = command !== upper;
    const ox = rel ? x : 0,
      oy = rel ? y : 0;
    if (upper === 'Z') {
      out.push('Z');
      x = startX;
      y = startY;
      lastCubic = lastQuad = null;
      command = '';
      continue;
    }
    if (i + ARITY[upper] > tokens.length || tokens.slice(i, i + ARITY[upper]).some((t) => /[a-zA-Z]/.test(t))) return cache('');
    let cubic: [number, number] | null = null;
    let quad: [number, number] | null = null;
    switch (upper) {
      case 'M':
        x = ox + num();
        y = oy + num();
        startX = x;
        startY = y;
        out.push(`M${fmt(x, y)}`);
        command = rel ? 'l' : 'L'; // further pairs are lines
        break;
      case 'L':
        x = ox + num();
        y = oy + num();
        out.push(`L${fmt(x, y)}`);
        break;
      case 'H':
        x = (rel ? x : 0) + num();
        out.push(`L${fmt(x, y)}`);
        break;
      case 'V':
        y = (rel ? y : 0) + num();
        out.push(`L${fmt(x, y)}`);
        break;
      case 'C': {
        const c = [ox + num(), oy + num(), ox + num(), oy + num(), ox + num(), oy + num()];
        out.push(`C${fmt(...c)}`);
        cubic = [c[2], c[3]];
        x = c[4];
        y = c[5];
        break;
      }
      case 'S': {
        const [c1x, c1y]: [number, number] = lastCubic ? [2 * x - lastCubic[0], 2 * y - lastCubic[1]] : [x, y];
        const c = [ox + num(), oy + num(), ox + num(), oy + num()];
        out.push(`C${fmt(c1x, c1y, ...c)}`);
        cubic = [c[0], c[1]];
        x = c[2];
        y = c[3];
        break;
      }
      case 'Q': {
        const c = [ox + num(), oy + num(), ox + num(), oy + num()];
        out.push(`Q${fmt(...c)}`);
        quad = [c[0], c[1]];
        x = c[2];
        y = c[3];
        break;
      }
      case 'T': {
        const qx: number = lastQuad ? 2 * x - lastQuad[0] : x;
        const qy: number = lastQuad ? 2 * y - lastQuad[1] : y;
        const ex = ox + num(),
          ey = oy + num();
        out.push(`Q${fmt(qx, qy, ex, ey)}`);
        quad = [qx, qy];
        x = ex;
        y = ey;
        break;
      }
    }
    lastCubic = cubic;
    lastQuad = quad;
  }
  return cache(out.join(' '));

  function cache(result: string): string {
    if (normalised.size > 20_000) normalised.clear();
    normalised.set(d, result);
    return result;
  }
}

function applyTransform(doc: PDFKit.PDFDocument, transform?: string): void {
  if (!transform) return;
  for (const [, name, args] of transform.matchAll(/(translate|scale)\(([^)]*)\)/g)) {
    const [a, b] = args
      .trim()
      .split(/[\s,]+/)
      .map(Number);
    if (name === 'translate') doc.translate(a, b ?? 0);
    else doc.scale(a, b ?? a);
  }
}

function drawOps(doc: PDFKit.PDFDocument, ops: DrawOp[], colour: string): void {
  for (const o of ops) {
    if (o.op === 'rect') {
      doc.rect(o.x, o.y, o.w, o.h).fill(colour);
      continue;
    }
    doc.save();
    applyTransform(doc, o.transform);
    if (o.op === 'path') doc.path(o.d).fill(colour);
    else drawOps(doc, o.children, colour);
    doc.restore();
  }
}

/**
 * Draws a converted formula into the box (x, y, w, h) with pdfkit's own path operator — some ten
 * times faster than an SVG renderer, which measures every curve. Returns false when the drawing holds
 * anything else, for the caller to draw its SVG instead.
 */
export function drawTex(doc: PDFKit.PDFDocument, t: TexSvg, x: number, y: number, w: number, colour: string): boolean {
  if (!t.ops) return false;
  const [minX, minY, vbW] = t.ops.viewBox;
  const s = w / vbW;
  doc.save().translate(x, y).scale(s).translate(-minX, -minY);
  drawOps(doc, t.ops.children, colour);
  doc.restore();
  return true;
}
