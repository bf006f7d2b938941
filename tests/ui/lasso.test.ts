// Lasso selection. Oracle: the even-odd (crossing number) rule of point-in-polygon testing
// (W. R. Franklin, PNPOLY): a point is inside when a ray from it crosses the boundary an odd
// number of times; worked cases on a square and on a concave L shape.
import { describe, expect, it } from 'vitest';
import { diesInPolygon, insidePolygon } from '../../src/ui/map/lasso';

const square = [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 10, y: 10 }, { x: 0, y: 10 }];
// An L: the square without its top-right quarter.
const ell = [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 10, y: 5 }, { x: 5, y: 5 }, { x: 5, y: 10 }, { x: 0, y: 10 }];

describe('insidePolygon', () => {
  it('puts the centre of a square inside and points beyond its sides outside', () => {
    expect(insidePolygon(square, 5, 5)).toBe(true);
    expect(insidePolygon(square, 11, 5)).toBe(false);
    expect(insidePolygon(square, 5, -1)).toBe(false);
  });

  it('leaves out the notch of a concave polygon', () => {
    expect(insidePolygon(ell, 2, 8)).toBe(true);
    expect(insidePolygon(ell, 8, 2)).toBe(true);
    expect(insidePolygon(ell, 8, 8)).toBe(false);
  });
});

describe('diesInPolygon', () => {
  it('selects the dies whose centres the outline encloses, through the die-to-screen transform', () => {
    // Dies on a 4 x 4 grid, 10 px per die, die (0, 0) centred at (5, 5) on screen, y down.
    const x = new Int32Array(16), y = new Int32Array(16);
    for (let i = 0; i < 16; i++) { x[i] = i % 4; y[i] = Math.floor(i / 4); }
    const transform: [number, number, number, number] = [5, 10, 5, 10];
    const picked = diesInPolygon([{ x: 0, y: 0 }, { x: 20, y: 0 }, { x: 20, y: 20 }, { x: 0, y: 20 }], x, y, transform);
    expect(picked.map((i) => `${x[i]},${y[i]}`).sort()).toEqual(['0,0', '0,1', '1,0', '1,1']);
    expect(diesInPolygon([{ x: 0, y: 0 }, { x: 20, y: 0 }], x, y, transform)).toEqual([]);
  });
});
