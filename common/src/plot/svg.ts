/**
 * A small SVG writer: elements as strings with every attribute and text escaped, so the same
 * markup can be put into the page and drawn into the PDF. No DOM is needed (the engine stays pure).
 */
import { PALETTE } from './palette';

export const PLOT_FONT = "'IBM Plex Sans', system-ui, sans-serif";

/** The plot colours: ink for the main trace, copper for the second, a muted grey for guides. */
export const PLOT_COLOURS = { ink: PALETTE.ink, copper: PALETTE.copper, green: PALETTE.pass, grey: PALETTE.grey, rule: PALETTE.rule, text: PALETTE.text };

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
export const escapeXml = (s: string): string => s.replace(/[&<>"']/g, (c) => ESCAPES[c]);

type Attrs = Record<string, string | number | undefined>;

const num = (v: number): string => (Number.isInteger(v) ? String(v) : v.toFixed(2).replace(/\.?0+$/, ''));

function attrs(a: Attrs): string {
  return Object.entries(a)
    .filter(([, v]) => v !== undefined && !(typeof v === 'number' && !Number.isFinite(v)))
    .map(([k, v]) => ` ${k}="${escapeXml(typeof v === 'number' ? num(v) : String(v))}"`)
    .join('');
}

export const el = (name: string, a: Attrs, children: string[] = []): string =>
  children.length ? `<${name}${attrs(a)}>${children.join('')}</${name}>` : `<${name}${attrs(a)}/>`;

export const text = (x: number, y: number, content: string, a: Attrs = {}): string =>
  `<text${attrs({ x, y, 'font-family': PLOT_FONT, 'font-size': 11, fill: PLOT_COLOURS.text, ...a })}>${escapeXml(content)}</text>`;

export function svgDocument(width: number, height: number, title: string, children: string[]): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeXml(title)}"><title>${escapeXml(title)}</title>${children.join('')}</svg>`;
}
