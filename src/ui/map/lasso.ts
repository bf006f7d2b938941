// Lasso selection: the dies whose cell centres lie inside a freehand polygon drawn on the map.
// Point in polygon by the even-odd crossing rule (a ray to +x crosses the edges an odd number of
// times inside), the standard test of computational geometry (W. R. Franklin's PNPOLY).

export interface Point { x: number; y: number }

export function insidePolygon(polygon: readonly Point[], px: number, py: number): boolean {
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i++) {
    const a = polygon[i], b = polygon[j];
    if ((a.y > py) !== (b.y > py) && px < ((b.x - a.x) * (py - a.y)) / (b.y - a.y) + a.x) inside = !inside;
  }
  return inside;
}

/**
 * Dies inside the polygon, given the affine map from die coordinates to screen points
 * (px = ax + bx * x, py = ay + by * y; see dieCentreTransform). Polygons of fewer than three
 * points hold nothing.
 */
export function diesInPolygon(polygon: readonly Point[], x: Int32Array, y: Int32Array,
  [ax, bx, ay, by]: readonly [number, number, number, number]): number[] {
  if (polygon.length < 3) return [];
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (const p of polygon) {
    if (p.x < minX) minX = p.x;
    if (p.x > maxX) maxX = p.x;
    if (p.y < minY) minY = p.y;
    if (p.y > maxY) maxY = p.y;
  }
  const found: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const px = ax + bx * x[i];
    const py = ay + by * y[i];
    if (px < minX || px > maxX || py < minY || py > maxY) continue;
    if (insidePolygon(polygon, px, py)) found.push(i);
  }
  return found;
}
