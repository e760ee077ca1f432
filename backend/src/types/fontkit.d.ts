/** The part of fontkit 2 (the font reader under pdfkit) that the tests use. */
declare module 'fontkit' {
  interface Glyph {
    id: number;
    path: { toSVG(): string };
  }
  export interface Font {
    postscriptName: string;
    numGlyphs: number;
    unitsPerEm: number;
    layout(text: string): { glyphs: Glyph[]; positions: { xAdvance: number }[] };
    getGlyph(id: number): Glyph;
  }
  export function create(buffer: Buffer): Font;
}
