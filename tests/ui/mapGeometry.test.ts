// Die grid and map layout. Oracles: plane geometry (Pythagoras for the circle that holds every
// die cell), the inverse relation between drawing a die and finding it under the mouse, and the
// gross-die-per-wafer approximation DPW = pi d^2 / (4 S) - pi d / sqrt(2 S) (a classic
// textbook formula, see DOMAIN.md) as a sanity bound on how many unit dies fit in the circle.
import { describe, expect, it } from 'vitest';
import { buildDieGrid, dieAtCell, diesInCellBox } from '../../src/ui/map/dieGrid';
import { cellAtPoint, cellCorner, dieCentreTransform, layoutMap } from '../../src/ui/map/mapLayout';

/** Unit dies whose whole cell lies inside a circle of the given radius, centred on (0, 0). */
function roundWafer(radius: number): { x: Int32Array; y: Int32Array } {
  const xs: number[] = [];
  const ys: number[] = [];
  const r = Math.ceil(radius);
  for (let y = -r; y <= r; y++) for (let x = -r; x <= r; x++) {
    if ((Math.abs(x) + 0.5) ** 2 + (Math.abs(y) + 0.5) ** 2 <= radius * radius) { xs.push(x); ys.push(y); }
  }
  return { x: Int32Array.from(xs), y: Int32Array.from(ys) };
}

describe('buildDieGrid', () => {
  it('finds every die at its own coordinates and nothing on empty cells', () => {
    const { x, y } = roundWafer(20);
    const grid = buildDieGrid(x, y);
    expect(grid.occupiedCells).toBe(x.length);
    for (let i = 0; i < x.length; i++) expect(dieAtCell(grid, x[i], y[i])).toBe(i);
    expect(dieAtCell(grid, 20, 20)).toBe(-1);
    expect(dieAtCell(grid, 1000, 0)).toBe(-1);
  });

  it('holds about as many unit dies as the gross-die-per-wafer formula says', () => {
    const radius = 60;
    const { x } = roundWafer(radius);
    const d = 2 * radius;
    const dpw = (Math.PI * d * d) / 4 - (Math.PI * d) / Math.sqrt(2);
    // The formula is an approximation of whole dies in the circle: within 3 % here.
    expect(Math.abs(x.length - dpw) / dpw).toBeLessThan(0.03);
  });

  it('draws the circle through the farthest die corner', () => {
    const grid = buildDieGrid(Int32Array.from([0, 3]), Int32Array.from([0, 4]));
    // Centre (1.5, 2); farthest corner is 1.5 + 0.5 = 2 and 2 + 0.5 = 2.5 away: sqrt(4 + 6.25).
    expect(grid.radius).toBeCloseTo(Math.sqrt(2 * 2 + 2.5 * 2.5), 12);
  });

  it('counts two dies on one cell once and shows the later one', () => {
    const grid = buildDieGrid(Int32Array.from([1, 1, 2]), Int32Array.from([1, 1, 1]));
    expect(grid.occupiedCells).toBe(2);
    expect(dieAtCell(grid, 1, 1)).toBe(1);
  });

  it('returns the dies of a box whatever the order of its corners', () => {
    const { x, y } = roundWafer(10);
    const grid = buildDieGrid(x, y);
    const found = diesInCellBox(grid, 2, -1, 3, 0).sort((a, b) => a - b);
    const expected = [...x.keys()].filter((i) => x[i] >= -1 && x[i] <= 2 && y[i] >= 0 && y[i] <= 3);
    expect(found).toEqual(expected);
  });

  it('refuses coordinates too far apart to be a die grid', () => {
    expect(() => buildDieGrid(Int32Array.from([0, 100000]), Int32Array.from([0, 100000]))).toThrow(/too many/);
  });
});

describe('layoutMap', () => {
  const { x, y } = roundWafer(30);
  const grid = buildDieGrid(x, y);

  it('finds under the mouse the die drawn there, with y up and with y down', () => {
    for (const yUp of [true, false]) {
      const layout = layoutMap(grid, 640, 480, yUp);
      const [ax, bx, ay, by] = dieCentreTransform(layout);
      for (let i = 0; i < x.length; i += 7) {
        const cell = cellAtPoint(layout, ax + bx * x[i], ay + by * y[i]);
        expect(cell).toEqual({ x: x[i], y: y[i] });
        const corner = cellCorner(layout, x[i], y[i]);
        expect(corner.x + layout.cell / 2).toBeCloseTo(ax + bx * x[i], 9);
        expect(corner.y + layout.cell / 2).toBeCloseTo(ay + by * y[i], 9);
      }
    }
  });

  it('puts larger y higher on screen by default and lower when flipped', () => {
    const up = layoutMap(grid, 500, 500, true);
    const down = layoutMap(grid, 500, 500, false);
    expect(cellCorner(up, 0, 10).y).toBeLessThan(cellCorner(up, 0, -10).y);
    expect(cellCorner(down, 0, 10).y).toBeGreaterThan(cellCorner(down, 0, -10).y);
  });

  it('fits the wafer circle inside the canvas and every die cell inside the circle', () => {
    const layout = layoutMap(grid, 800, 450, true);
    expect(layout.centreY + layout.radius).toBeLessThanOrEqual(450);
    expect(layout.centreY - layout.radius).toBeGreaterThanOrEqual(0);
    for (let i = 0; i < x.length; i++) {
      const c = cellCorner(layout, x[i], y[i]);
      for (const [px, py] of [[c.x, c.y], [c.x + layout.cell, c.y], [c.x, c.y + layout.cell], [c.x + layout.cell, c.y + layout.cell]]) {
        expect(Math.hypot(px - layout.centreX, py - layout.centreY)).toBeLessThanOrEqual(layout.radius + 1e-9);
      }
    }
  });
});
