// Zoom and pan of the wafer map. Oracle: the defining property of zooming about a point (the
// point under the cursor stays where it is, everything else scales by the factor about it), and
// the limits the view promises (1x to 40x).
import { describe, expect, it } from 'vitest';
import { buildDieGrid } from '../../src/ui/map/dieGrid';
import { cellCorner, IDENTITY_VIEW, layoutMap, MAX_ZOOM, viewedLayout, zoomAbout } from '../../src/ui/map/mapLayout';

const grid = buildDieGrid(Int32Array.from([0, 1, 2, 0, 1, 2]), Int32Array.from([0, 0, 0, 1, 1, 1]));
const W = 400, H = 300;
const base = layoutMap(grid, W, H);
/** Where a point of the unzoomed map lands in a view. */
const through = (view: typeof IDENTITY_VIEW, px: number, py: number) => ({
  x: W / 2 + (px - W / 2) * view.zoom + view.panX, y: H / 2 + (py - H / 2) * view.zoom + view.panY,
});

describe('zoomAbout', () => {
  it('keeps the point under the cursor fixed while zooming in, then again from a zoomed view', () => {
    const v1 = zoomAbout(IDENTITY_VIEW, 2, 100, 80, W, H);
    expect(through(v1, 100, 80).x).toBeCloseTo(100, 9);
    expect(through(v1, 100, 80).y).toBeCloseTo(80, 9);
    // The screen point (250, 200) of v1 comes from an unzoomed point b; after zooming about it, b stays at (250, 200).
    const b = { x: W / 2 + (250 - W / 2 - v1.panX) / v1.zoom, y: H / 2 + (200 - H / 2 - v1.panY) / v1.zoom };
    const v2 = zoomAbout(v1, 1.5, 250, 200, W, H);
    expect(v2.zoom).toBeCloseTo(3, 12);
    expect(through(v2, b.x, b.y).x).toBeCloseTo(250, 9);
    expect(through(v2, b.x, b.y).y).toBeCloseTo(200, 9);
  });

  it('never zooms out past the whole wafer nor in past the largest zoom', () => {
    expect(zoomAbout({ zoom: 1.2, panX: 30, panY: -4 }, 0.5, 10, 10, W, H)).toEqual(IDENTITY_VIEW);
    expect(zoomAbout(IDENTITY_VIEW, 1000, 10, 10, W, H).zoom).toBe(MAX_ZOOM);
  });
});

describe('viewedLayout', () => {
  it('scales cells by the zoom and moves every cell corner the same way as any other point', () => {
    const view = { zoom: 2.5, panX: 12, panY: -7 };
    const zoomed = viewedLayout(base, view, W, H);
    expect(zoomed.cell).toBeCloseTo(base.cell * 2.5, 12);
    const before = cellCorner(base, 2, 1);
    const after = cellCorner(zoomed, 2, 1);
    const expected = through(view, before.x, before.y);
    expect(after.x).toBeCloseTo(expected.x, 9);
    expect(after.y).toBeCloseTo(expected.y, 9);
  });
});
