import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import * as fontkit from 'fontkit';
import { describe, expect, it } from 'vitest';
import { woffToSfnt } from './woff';

const woffOf = (pkg: string, file: string) => readFileSync(join(dirname(require.resolve(`${pkg}/package.json`)), 'fonts', 'complete', 'woff', file));

describe('woffToSfnt', () => {
  it('unpacks the IBM Plex WOFF files into fonts fontkit reads exactly as it reads the WOFF (fontkit, the reader pdfkit uses)', () => {
    for (const [pkg, file] of [
      ['@ibm/plex-sans', 'IBMPlexSans-Regular.woff'],
      ['@ibm/plex-sans', 'IBMPlexSans-SemiBold.woff'],
      ['@ibm/plex-mono', 'IBMPlexMono-Regular.woff'],
    ]) {
      const woff = woffOf(pkg, file);
      const sfnt = woffToSfnt(woff);
      const a = fontkit.create(woff);
      const b = fontkit.create(sfnt);
      expect(b.postscriptName).toBe(a.postscriptName);
      expect(b.numGlyphs).toBe(a.numGlyphs);
      expect(b.unitsPerEm).toBe(a.unitsPerEm);
      const text = 'Ampwright: I = 11.85 A, Z = 27.44 Ω, φ = −68.6°';
      const ra = a.layout(text);
      const rb = b.layout(text);
      expect(rb.glyphs.map((g) => g.id)).toEqual(ra.glyphs.map((g) => g.id));
      expect(rb.positions.map((p) => p.xAdvance)).toEqual(ra.positions.map((p) => p.xAdvance));
      expect(b.getGlyph(rb.glyphs[0].id).path.toSVG()).toBe(a.getGlyph(ra.glyphs[0].id).path.toSVG());
    }
  });

  it('refuses a file that is not WOFF 1.0', () => {
    expect(() => woffToSfnt(Buffer.from('OTTO0000000000000000000000000000000000000000'))).toThrow(/not a WOFF 1.0 file/);
  });
});
