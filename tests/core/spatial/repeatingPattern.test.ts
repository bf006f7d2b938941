import { describe, expect, it } from 'vitest';
import { createRandom, layoutWafer, positiveModulo, Random, selectDies } from '../../../src/core/generator';
import { findRepeatingPattern } from '../../../src/core/spatial';

// Oracle: the touchdown geometry itself (common practice: the probe card steps by sitesX x sitesY
// dies, so one site is one residue class of x and y); the expected class is worked out here.

function siteMask(sitesX: number, sitesY: number, site: number, fill: number, noise: number, seed: number) {
  const layout = layoutWafer({ dieWidthMm: 4, dieHeightMm: 4, sitesX, sitesY });
  const random = createRandom(seed);
  const flagged = new Uint8Array(layout.x.length);
  for (const d of selectDies({ kind: 'site', site }, layout, new Random(seed))) if (random.next() < fill) flagged[d] = 1;
  for (let i = 0; i < flagged.length; i++) if (random.next() < noise) flagged[i] = 1;
  return { layout, flagged };
}

describe('findRepeatingPattern', () => {
  it('names the probe site when the site column is given', () => {
    const { layout, flagged } = siteMask(2, 2, 4, 0.8, 0.01, 1);
    const found = findRepeatingPattern(flagged, layout.x, layout.y, layout.site);
    expect(found?.kind).toBe('probe-site');
    expect(found?.site).toBe(4);
    expect(found!.rate).toBeGreaterThan(0.7);
    expect(found!.othersRate).toBeLessThan(0.03);
  });

  it('finds the lattice of a 4 x 1 touchdown from x and y alone', () => {
    // Site s of a 4 x 1 card is x = s - 1 (mod 4), any y.
    const { layout, flagged } = siteMask(4, 1, 3, 0.9, 0.02, 2);
    const found = findRepeatingPattern(flagged, layout.x, layout.y);
    expect(found).toMatchObject({ kind: 'lattice', periodX: 4, periodY: 1, residueX: 2, residueY: 0 });
    layout.x.forEach((x, i) => expect(found!.members[i]).toBe(positiveModulo(x, 4) === 2 ? 1 : 0));
  });

  it('finds a 2 x 2 site as the 2 x 2 lattice, not as a coarser or finer one', () => {
    const { layout, flagged } = siteMask(2, 2, 2, 1, 0, 3);
    expect(findRepeatingPattern(flagged, layout.x, layout.y)).toMatchObject({ periodX: 2, periodY: 2, residueX: 1, residueY: 0 });
  });

  it('ignores flags spread evenly over all sites and a pattern that is not on a lattice', () => {
    const layout = layoutWafer({ dieWidthMm: 4, dieHeightMm: 4 });
    const random = createRandom(4);
    const scatter = Uint8Array.from(layout.x, () => (random.next() < 0.2 ? 1 : 0));
    expect(findRepeatingPattern(scatter, layout.x, layout.y, layout.site)).toBeUndefined();
    const blob = Uint8Array.from(layout.x, (_, i) => (Math.hypot(layout.centreXMm[i], layout.centreYMm[i]) < 60 ? 1 : 0));
    expect(findRepeatingPattern(blob, layout.x, layout.y, layout.site)).toBeUndefined();
  });
});
