// NNR (Daasch et al., "Neighbor selection for variance reduction in IDDQ and other parametric
// data", IEEE ITC 2001: residual = value - median of the die's neighbours) and GDBN (a passing die
// whose neighbours mostly fail; common practice) on small grids worked by hand.
import { describe, expect, it } from 'vitest';
import { analyzeLot, neighbourhood, nnrResiduals } from '../../../src/core/analysis';
import type { WaferFrame } from '../../../src/core/frame';

function grid(size: number): { x: Int32Array; y: Int32Array } {
  const x: number[] = [];
  const y: number[] = [];
  for (let j = 0; j < size; j++) for (let i = 0; i < size; i++) { x.push(i); y.push(j); }
  return { x: Int32Array.from(x), y: Int32Array.from(y) };
}

describe('neighbourhood', () => {
  it('lists the 8 dies around an inner die, 3 at a corner, and 24 with radius 2', () => {
    const { x, y } = grid(5);
    const hood = neighbourhood(x, y, 1);
    const of = (i: number, h = hood) => Array.from(h.list.subarray(h.start[i], h.start[i + 1])).sort((a, b) => a - b);
    // Die (2,2) is index 12; its neighbours are indices 6, 7, 8, 11, 13, 16, 17, 18.
    expect(of(12)).toEqual([6, 7, 8, 11, 13, 16, 17, 18]);
    expect(of(0)).toEqual([1, 5, 6]);
    expect(of(12, neighbourhood(x, y, 2))).toHaveLength(24);
  });
});

describe('nnrResiduals', () => {
  it('subtracts the median of the finite neighbours (hand-worked)', () => {
    const { x, y } = grid(3);
    // Centre 10; neighbours 1..8 -> median (4 + 5)/2 = 4.5 -> residual 5.5.
    const values = Float64Array.from([1, 2, 3, 4, 10, 5, 6, 7, 8]);
    const { residual, count } = nnrResiduals(values, neighbourhood(x, y, 1));
    expect(residual[4]).toBe(5.5);
    expect(count[4]).toBe(8);
    // Corner die 0 (value 1): neighbours 2, 4, 10 -> median 4 -> residual -3.
    expect(residual[0]).toBe(-3);
    // With one neighbour missing the median of the other 7 counts: 1,2,3,4,5,6,7 -> 4; 10 - 4 = 6.
    values[8] = NaN;
    expect(nnrResiduals(values, neighbourhood(x, y, 1)).residual[4]).toBe(6);
  });
});

describe('NNR and GDBN in the analysis', () => {
  function frame(values: Float64Array, x: Int32Array, y: Int32Array): WaferFrame {
    return { lot: 'G.1', wafer: '01', x, y, site: new Int32Array(x.length).fill(-1), params: [{ name: 'Ioff_n', unit: 'A' }], values: { Ioff_n: values } };
  }

  it('flags a die that stands out from its neighbours but not from the wafer', () => {
    // A gradient of 1 decade across a 40 x 40 grid with uniform noise of +/- 0.05 decade: no die
    // is beyond 6 robust sigma of the wafer (robust sigma about 0.37 decade), but one die 0.5
    // decade above its neighbours is, for NNR (residual robust sigma about 0.04 decade).
    const { x, y } = grid(40);
    let seed = 7;
    const noise = () => ((seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5) * 0.1;
    const values = Float64Array.from(x, (xi, i) => 10 ** (-11 + xi / 40 + noise() + (i === 820 ? 0.5 : 0)));
    const analysis = analyzeLot([frame(values, x, y)], { settings: { methods: { patWafer: true, patLot: false, patStatic: false, nnr: true, gdbn: false } } });
    expect(analysis.flagged.map((f) => f.index)).toEqual([820]);
    expect(analysis.flagged[0].reasons.map((r) => r.method)).toEqual(['nnr']);
    expect(analysis.flagged[0].reasons[0].direction).toBe('high');
  });

  it('names a passing die whose neighbours are all flagged a good die in a bad neighbourhood', () => {
    // A 3 x 3 block of dies 3 decades high with a normal die at its centre: the eight are
    // flagged by PAT; the centre die passes but all 8 of its neighbours fail.
    const { x, y } = grid(30);
    let seed = 3;
    const noise = () => ((seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5) * 0.05;
    const centre = 15 * 30 + 15;
    const block = new Set([-31, -30, -29, -1, 1, 29, 30, 31].map((d) => centre + d));
    const values = Float64Array.from(x, (_, i) => 10 ** (-11 + noise() + (block.has(i) ? 3 : 0)));
    const analysis = analyzeLot([frame(values, x, y)], { settings: { methods: { patWafer: true, patLot: false, patStatic: false, nnr: false, gdbn: true } } });
    const gdbn = analysis.flagged.filter((f) => f.reasons.some((r) => r.method === 'gdbn'));
    expect(gdbn.map((f) => f.index)).toEqual([centre]);
    const reason = gdbn[0].reasons[0];
    expect(reason.method === 'gdbn' && [reason.badNeighbours, reason.neighbours]).toEqual([8, 8]);
    expect(analysis.flagged.filter((f) => block.has(f.index))).toHaveLength(8);
  });
});
