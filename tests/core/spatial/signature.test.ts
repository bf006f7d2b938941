import { describe, expect, it } from 'vitest';
import { createRandom, layoutWafer, selectDies, Random } from '../../../src/core/generator';
import { labelWafer, SIGNATURE_LABELS, synthesiseWafer, type SignatureLabel } from '../../../src/core/spatial';

// Acceptance for the signature labels (vocabulary of Wu, Jang & Chen, IEEE TSM 28(1), 2015). The
// oracle is the planted truth: maps built on the demo generator's wafer layout and excursion
// shapes, each label at random sizes, places and angles, on die sizes from 1 to 10 mm and on 300,
// 200 and 150 mm wafers (SEMI M1 diameters), with holes in the pattern (80-100 % fill) and a
// random background of 0.2-3 % flagged dies.

const DIE_SIZES_MM = [1, 2, 3.5, 5, 7.5, 10];
/** Maps per label and die size on each wafer diameter. */
const PER_SIZE: [number, number][] = [[300, 4], [200, 2], [150, 1]];
const SEED = 2015;

function labelOf(label: SignatureLabel, dieSizeMm: number, rep: number, waferDiameterMm = 300, withSite = true) {
  const stream = createRandom(SEED, SIGNATURE_LABELS.indexOf(label), Math.round(dieSizeMm * 10), rep, waferDiameterMm);
  const wafer = synthesiseWafer(label, stream, { dieSizeMm, waferDiameterMm });
  return { wafer, result: labelWafer({ x: wafer.x, y: wafer.y, flagged: wafer.flagged, ...(withSite ? { site: wafer.site } : {}) }) };
}

describe('labelWafer on synthetic maps', () => {
  it('labels at least 95 % of maps right overall and at least 85 % of every label', () => {
    const confusion = new Map(SIGNATURE_LABELS.map((t) => [t, new Map(SIGNATURE_LABELS.map((l) => [l, 0]))]));
    const misses: string[] = [];
    for (const truth of SIGNATURE_LABELS) {
      for (const size of DIE_SIZES_MM) {
        for (const [diameter, count] of PER_SIZE) {
          for (let rep = 0; rep < count; rep++) {
            const { wafer, result } = labelOf(truth, size, rep, diameter);
            const row = confusion.get(truth)!;
            row.set(result.label, row.get(result.label)! + 1);
            if (result.label !== truth) misses.push(`${wafer.description}, ${size} mm dies on ${diameter} mm (${wafer.x.length} dies) -> ${result.label}: ${result.evidence.rule}`);
          }
        }
      }
    }
    const width = 10;
    const lines = [['truth \\ label', ...SIGNATURE_LABELS].map((s) => s.padStart(width)).join('')];
    let correct = 0;
    let total = 0;
    const perLabel: Record<string, number> = {};
    for (const truth of SIGNATURE_LABELS) {
      const row = confusion.get(truth)!;
      const n = [...row.values()].reduce((a, b) => a + b, 0);
      perLabel[truth] = row.get(truth)! / n;
      correct += row.get(truth)!;
      total += n;
      lines.push([truth, ...SIGNATURE_LABELS.map((l) => String(row.get(l)))].map((s) => s.padStart(width)).join(''));
    }
    console.log(`signature confusion matrix (${total} maps, ${(100 * correct / total).toFixed(1)} % correct)\n${lines.join('\n')}${misses.length ? `\nmisses:\n${misses.join('\n')}` : ''}`);
    expect(correct / total).toBeGreaterThanOrEqual(0.95);
    for (const truth of SIGNATURE_LABELS) expect(perLabel[truth], truth).toBeGreaterThanOrEqual(0.85);
  });

  it('gives the same labels with the x or y axis flipped, swapped or the origin moved', () => {
    for (const truth of SIGNATURE_LABELS) {
      for (const size of [1.5, 4, 10]) {
        const { wafer, result } = labelOf(truth, size, 7);
        const variants: [Int32Array, Int32Array][] = [
          [wafer.x.map((v) => -v), wafer.y],
          [wafer.x, wafer.y.map((v) => -v)],
          [wafer.x.map((v) => 31 - v), wafer.y.map((v) => v + 17)],
          [wafer.y, wafer.x],
        ];
        for (const [x, y] of variants) {
          expect(labelWafer({ x, y, flagged: wafer.flagged, site: wafer.site }).label, `${wafer.description} at ${size} mm`).toBe(result.label);
        }
        // Telling the labeller the axis points the other way undoes the flip: the same die angles come back.
        const told = labelWafer({ x: wafer.x.map((v) => -v), y: wafer.y, flagged: wafer.flagged, geometry: { xPositive: 'left' } });
        expect(told.evidence.angularConcentration).toBeCloseTo(labelWafer({ x: wafer.x, y: wafer.y, flagged: wafer.flagged }).evidence.angularConcentration, 9);
      }
    }
  });
});

describe('labelWafer rules', () => {
  const layout = layoutWafer({ dieWidthMm: 5, dieHeightMm: 5 });
  const n = layout.x.length;
  const maskFrom = (dies: number[]) => {
    const mask = new Uint8Array(n);
    for (const d of dies) mask[d] = 1;
    return mask;
  };

  it('calls a probe-site bias spread over the wafer none, and says which site it set aside', () => {
    // One site of the 2 x 2 touchdown reads off everywhere: every fourth die in a regular lattice.
    const flagged = maskFrom(selectDies({ kind: 'site', site: 3 }, layout, new Random(1)));
    const withSite = labelWafer({ x: layout.x, y: layout.y, flagged, site: layout.site });
    expect(withSite.label).toBe('none');
    expect(withSite.evidence.repeating?.kind).toBe('probe-site');
    expect(withSite.evidence.repeating?.site).toBe(3);
    // Without a site column the lattice itself is recognised: site 3 is x = 0 (mod 2), y = 1 (mod 2).
    const fromGrid = labelWafer({ x: layout.x, y: layout.y, flagged });
    expect(fromGrid.label).toBe('none');
    expect(fromGrid.evidence.repeating).toMatchObject({ kind: 'lattice', periodX: 2, periodY: 2, residueX: 0, residueY: 1 });
  });

  it('still reads a real pattern underneath a probe-site bias', () => {
    const site = selectDies({ kind: 'site', site: 2 }, layout, new Random(1));
    const centre = selectDies({ kind: 'center', radiusFraction: 0.35 }, layout, new Random(1));
    const result = labelWafer({ x: layout.x, y: layout.y, flagged: maskFrom([...site, ...centre]), site: layout.site });
    expect(result.label).toBe('center');
  });

  it('does not mistake a straight row of dies for a probe-site lattice', () => {
    const row = Array.from(layout.x.keys()).filter((i) => layout.y[i] === 4);
    const result = labelWafer({ x: layout.x, y: layout.y, flagged: maskFrom(row) });
    expect(result.evidence.repeating).toBeUndefined();
    expect(result.label).toBe('scratch');
    expect(result.evidence.line?.angleDeg! % 180).toBeCloseTo(0, 6);
  });

  it('calls an empty map none and a fully flagged map near-full', () => {
    expect(labelWafer({ x: layout.x, y: layout.y, flagged: new Uint8Array(n) }).label).toBe('none');
    const all = labelWafer({ x: layout.x, y: layout.y, flagged: new Uint8Array(n).fill(1) });
    expect(all.label).toBe('near-full');
    expect(all.confidence).toBeGreaterThan(0.9);
  });

  it('reports evidence that separates an edge ring from an edge sector', () => {
    const ring = labelWafer({ x: layout.x, y: layout.y, flagged: maskFrom(selectDies({ kind: 'edge-ring', innerFraction: 0.85 }, layout, new Random(1))) });
    const sector = labelWafer({ x: layout.x, y: layout.y, flagged: maskFrom(selectDies({ kind: 'edge-loc', innerFraction: 0.8, angleDeg: 30, spanDeg: 80 }, layout, new Random(1))) });
    expect(ring.label).toBe('edge-ring');
    expect(sector.label).toBe('edge-loc');
    expect(ring.evidence.angularCoverage).toBeGreaterThan(0.9);
    expect(sector.evidence.angularCoverage).toBeLessThan(0.4);
    expect(sector.evidence.angularConcentration).toBeGreaterThan(ring.evidence.angularConcentration + 0.5);
    expect(ring.evidence.radialClusterDensity[9]).toBeGreaterThan(0.5);
    expect(ring.evidence.radialClusterDensity[2]).toBe(0);
    expect(sector.clusters[0].centroidAngleDeg).toBeGreaterThan(15);
    expect(sector.clusters[0].centroidAngleDeg).toBeLessThan(45);
  });

  it('is deterministic and keeps confidence between 0.5 and 0.99', () => {
    const { wafer } = labelOf('loc', 3, 1);
    const a = labelWafer({ x: wafer.x, y: wafer.y, flagged: wafer.flagged });
    const b = labelWafer({ x: wafer.x, y: wafer.y, flagged: wafer.flagged });
    expect(b).toEqual(a);
    expect(a.confidence).toBeGreaterThanOrEqual(0.5);
    expect(a.confidence).toBeLessThanOrEqual(0.99);
  });

  it('gives the same answer whatever was labelled before, even when the caller rewrites its arrays', () => {
    // Grid geometry is reused between calls with the same grid; it must never leak into another grid.
    const a = labelOf('edge-loc', 4, 2).wafer;
    const b = labelOf('donut', 6, 2).wafer;
    const first = labelWafer({ x: a.x, y: a.y, flagged: a.flagged });
    labelWafer({ x: b.x, y: b.y, flagged: b.flagged });
    expect(labelWafer({ x: a.x, y: a.y, flagged: a.flagged })).toEqual(first);
    const x = a.x.slice();
    const y = a.y.slice();
    const before = labelWafer({ x, y, flagged: a.flagged });
    for (let i = 0; i < x.length; i++) { x[i] = -x[i]; y[i] += 9; } // same arrays, new values
    const after = labelWafer({ x, y, flagged: a.flagged });
    expect(after).toEqual(labelWafer({ x: x.slice(), y: y.slice(), flagged: a.flagged }));
    expect(after.label).toBe(before.label);
    expect(after.clusters[0].centroidXMm).toBeCloseTo(-before.clusters[0].centroidXMm, 9);
  });

  it('refuses arrays of different lengths', () => {
    expect(() => labelWafer({ x: layout.x, y: layout.y, flagged: new Uint8Array(3) })).toThrow(/same length/);
  });
});
