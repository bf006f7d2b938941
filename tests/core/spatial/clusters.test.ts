import { describe, expect, it } from 'vitest';
import { createRandom, layoutWafer } from '../../../src/core/generator';
import { buildDieGrid, findClusters, joinCount, placeDies } from '../../../src/core/spatial';

// Oracles: a separate union-find written here (Galler & Fischer 1964) for the components; the
// definition of 8-neighbour connectivity (DOMAIN.md); uniform-bar moments (a bar of length L has
// variance L^2/12); and exhaustive enumeration for the join-count moments.

const layout = layoutWafer({ dieWidthMm: 5, dieHeightMm: 5 });
const placement = placeDies(layout.x, layout.y, { dieWidthMm: 5, dieHeightMm: 5, centreX: 0, centreY: 0 });
const index = new Map(Array.from(layout.x, (x, i) => [`${x},${layout.y[i]}`, i]));
const at = (x: number, y: number) => index.get(`${x},${y}`) as number;

function maskOf(points: [number, number][]): Uint8Array {
  const mask = new Uint8Array(layout.x.length);
  for (const [x, y] of points) mask[at(x, y)] = 1;
  return mask;
}

function unionFindSizes(mask: Uint8Array, x: Int32Array, y: Int32Array): number[] {
  const parent = Array.from(mask, (_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  const flagged = Array.from(mask.keys()).filter((i) => mask[i]);
  for (const a of flagged) for (const b of flagged) {
    if (a < b && Math.abs(x[a] - x[b]) <= 1 && Math.abs(y[a] - y[b]) <= 1) parent[find(a)] = find(b);
  }
  const sizes = new Map<number, number>();
  for (const i of flagged) sizes.set(find(i), (sizes.get(find(i)) ?? 0) + 1);
  return [...sizes.values()].sort((p, q) => q - p);
}

describe('findClusters', () => {
  it('joins dies that touch at a corner and keeps dies two steps apart separate', () => {
    const { clusters } = findClusters(maskOf([[0, 0], [1, 1], [4, 0], [6, 0]]), layout.x, layout.y, placement);
    expect(clusters.map((c) => c.size)).toEqual([2, 1, 1]);
  });

  it('finds the same components as a brute-force union-find on random masks', () => {
    const random = createRandom(11);
    for (const rate of [0.05, 0.2, 0.45]) {
      const mask = Uint8Array.from(layout.x, () => (random.next() < rate ? 1 : 0));
      const { clusters } = findClusters(mask, layout.x, layout.y, placement);
      expect(clusters.map((c) => c.size)).toEqual(unionFindSizes(mask, layout.x, layout.y));
      expect(clusters.reduce((n, c) => n + c.size, 0)).toBe(mask.reduce((n, v) => n + v, 0));
    }
  });

  it('drops components below the minimum size', () => {
    const { clusters } = findClusters(maskOf([[0, 0], [1, 1], [4, 0]]), layout.x, layout.y, placement, { minSize: 2 });
    expect(clusters).toHaveLength(1);
  });

  it('measures a row of ten dies as a horizontal line ten dies long and one die wide', () => {
    // Ten 5 mm dies side by side form a uniform 50 x 5 mm bar: sqrt(12) sigma gives back 50 and 5.
    const row = Array.from({ length: 10 }, (_, k) => [k - 3, 2] as [number, number]);
    const [c] = findClusters(maskOf(row), layout.x, layout.y, placement).clusters;
    expect(c.lengthMm).toBeCloseTo(50, 9);
    expect(c.widthMm).toBeCloseTo(5, 9);
    expect(c.majorAxisDeg % 180).toBeCloseTo(0, 9);
    expect(c.elongation).toBeCloseTo(10, 9);
    expect(c.centroidXMm).toBeCloseTo(7.5, 9);
    expect(c.centroidYMm).toBeCloseTo(10, 9);
    expect(c.line).toBe(true);
  });

  it('measures a square block as round, not a line, with its reach to the corner dies', () => {
    const block: [number, number][] = [];
    for (let x = 10; x < 15; x++) for (let y = -2; y < 3; y++) block.push([x, y]);
    const [c] = findClusters(maskOf(block), layout.x, layout.y, placement).clusters;
    expect(c.size).toBe(25);
    expect(c.elongation).toBeCloseTo(1, 9);
    expect(c.centroidXMm).toBeCloseTo(60, 9);
    expect(c.radiusMm).toBeCloseTo(Math.hypot(10, 10), 9);
    expect(c.line).toBe(false);
  });

  it('reads a thin diagonal as a line along 45 degrees', () => {
    const diagonal = Array.from({ length: 12 }, (_, k) => [k - 6, k - 6] as [number, number]);
    const [c] = findClusters(maskOf(diagonal), layout.x, layout.y, placement).clusters;
    expect(c.majorAxisDeg).toBeCloseTo(45, 6);
    expect(c.line).toBe(true);
  });

  it('does not call a thin arc along the wafer edge a line', () => {
    // Edge dies between 20 and 110 degrees: they follow a circle round the centre, not a straight line.
    const mask = Uint8Array.from(layout.x, (_, i) => (placement.edge[i] && placement.angleDeg[i] > 20 && placement.angleDeg[i] < 110 ? 1 : 0));
    const { clusters } = findClusters(mask, layout.x, layout.y, placement, { minSize: 5 });
    expect(clusters.length).toBeGreaterThan(0);
    for (const c of clusters) expect(c.line).toBe(false);
    expect(clusters[0].arcResidualMm).toBeLessThan(clusters[0].lineResidualMm);
  });
});

describe('joinCount', () => {
  it('matches the mean and variance of every placement of 3 flags on a 3 x 3 grid', () => {
    // Exhaustive enumeration of all C(9, 3) = 84 placements is the exact randomisation distribution.
    const x = Int32Array.from({ length: 9 }, (_, i) => i % 3);
    const y = Int32Array.from({ length: 9 }, (_, i) => Math.floor(i / 3));
    const grid = buildDieGrid(x, y);
    const counts: number[] = [];
    let reported = joinCount(new Uint8Array(9), x, y, grid);
    for (let a = 0; a < 9; a++) for (let b = a + 1; b < 9; b++) for (let c = b + 1; c < 9; c++) {
      const mask = new Uint8Array(9);
      mask[a] = mask[b] = mask[c] = 1;
      reported = joinCount(mask, x, y, grid);
      counts.push(reported.flaggedJoins);
    }
    const mean = counts.reduce((s, v) => s + v, 0) / counts.length;
    const variance = counts.reduce((s, v) => s + (v - mean) ** 2, 0) / counts.length;
    expect(reported.joins).toBe(20); // 3 x 3 king-move graph: 6 + 6 horizontal/vertical + 8 diagonal
    expect(reported.expected).toBeCloseTo(mean, 12);
    expect(reported.sd).toBeCloseTo(Math.sqrt(variance), 12);
  });

  it('is near zero for a random scatter, large for a blob and negative for a site lattice', () => {
    const grid = buildDieGrid(layout.x, layout.y);
    const random = createRandom(3);
    const scatter = Uint8Array.from(layout.x, () => (random.next() < 0.1 ? 1 : 0));
    expect(Math.abs(joinCount(scatter, layout.x, layout.y, grid).z)).toBeLessThan(3.5);
    const blob = Uint8Array.from(layout.x, (_, i) => (Math.hypot(layout.centreXMm[i] - 40, layout.centreYMm[i]) < 25 ? 1 : 0));
    expect(joinCount(blob, layout.x, layout.y, grid).z).toBeGreaterThan(10);
    const lattice = Uint8Array.from(layout.site, (s) => (s === 2 ? 1 : 0));
    expect(joinCount(lattice, layout.x, layout.y, grid).z).toBeLessThan(-5);
  });
});
