// The map's colour ramp. Oracles: entries of the published viridis table `_viridis_data`
// (Smith, van der Walt and Firing, matplotlib lib/matplotlib/_cm_listed.py, CC0) that are NOT
// among the ramp's control points, and the WCAG 2.1 relative luminance formula (W3C), which must
// rise along the ramp because viridis was designed with monotonically increasing lightness.
import { describe, expect, it } from 'vitest';
import { rampGradientCss, rampTable, rgbToHex, viridis } from '../../src/ui/map/colorRamp';

/** Rows of _viridis_data by index (0..255), r, g, b in 0..1, copied from the published table. */
const PUBLISHED: [number, number, number, number][] = [
  [0, 0.267004, 0.004874, 0.329415],
  [28, 0.281412, 0.155834, 0.469201],
  [57, 0.243113, 0.292092, 0.538516],
  [85, 0.190631, 0.407061, 0.556089],
  [113, 0.147607, 0.511733, 0.557049],
  [142, 0.119699, 0.618490, 0.536347],
  [170, 0.208030, 0.718701, 0.472873],
  [198, 0.421908, 0.805774, 0.351910],
  [227, 0.709898, 0.868751, 0.169257],
  [255, 0.993248, 0.906157, 0.143936],
];

function relativeLuminance([r, g, b]: number[]): number {
  // WCAG 2.1, "relative luminance": linearise sRGB, then 0.2126 R + 0.7152 G + 0.0722 B.
  const lin = (c: number) => { const s = c / 255; return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4; };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

describe('viridis ramp', () => {
  it('matches the published table within two 8-bit steps, also between control points', () => {
    for (const [index, r, g, b] of PUBLISHED) {
      const [cr, cg, cb] = viridis(index / 255);
      expect(Math.abs(cr - r * 255)).toBeLessThanOrEqual(2);
      expect(Math.abs(cg - g * 255)).toBeLessThanOrEqual(2);
      expect(Math.abs(cb - b * 255)).toBeLessThanOrEqual(2);
    }
  });

  it('starts dark violet (#440154) and ends yellow (#fde725)', () => {
    expect(rgbToHex(viridis(0))).toBe('#440154');
    expect(rgbToHex(viridis(1))).toBe('#fde725');
  });

  it('gets lighter along the ramp', () => {
    // Over 256 steps, neighbours may differ by less than 8-bit rounding: allow 0.3 % dips.
    const table = rampTable(256);
    let previous = -1;
    for (let i = 0; i < 256; i++) {
      const luminance = relativeLuminance([table[i * 4], table[i * 4 + 1], table[i * 4 + 2]]);
      expect(luminance).toBeGreaterThanOrEqual(previous * 0.997);
      previous = luminance;
    }
    // Sixteen steps apart, it is strictly lighter every time.
    for (let i = 16; i < 256; i += 16) {
      expect(relativeLuminance(viridis(i / 255))).toBeGreaterThan(relativeLuminance(viridis((i - 16) / 255)));
    }
    expect(relativeLuminance(viridis(1))).toBeGreaterThan(10 * relativeLuminance(viridis(0)));
  });

  it('clamps positions outside 0..1 and treats NaN as the low end', () => {
    expect(viridis(-3)).toEqual(viridis(0));
    expect(viridis(7)).toEqual(viridis(1));
    expect(viridis(NaN)).toEqual(viridis(0));
  });

  it('builds an opaque lookup table and a CSS gradient with the same ends', () => {
    const table = rampTable(16);
    for (let i = 0; i < 16; i++) expect(table[i * 4 + 3]).toBe(255);
    const css = rampGradientCss(5);
    expect(css.startsWith('linear-gradient(to right, #440154 0.0%')).toBe(true);
    expect(css.endsWith('#fde725 100.0%)')).toBe(true);
  });
});
