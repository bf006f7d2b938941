// Many points drawn as a density image: each point adds one to the pixel it falls on, and a pixel's
// opacity grows with log(1 + count), so 1.5 million points cost one pass over typed arrays and
// one image, and dense regions stay distinguishable instead of saturating.

export interface DensityBounds { xMin: number; xMax: number; yMin: number; yMax: number }

/** Counts per pixel (row 0 at yMax) of the points whose group differs from `skipGroup`. */
export function densityCounts(x: Float64Array, y: Float64Array, group: Int32Array, skipGroup: number,
  bounds: DensityBounds, width: number, height: number): { counts: Uint32Array; max: number; points: number } {
  const counts = new Uint32Array(width * height);
  const sx = width / (bounds.xMax - bounds.xMin || 1);
  const sy = height / (bounds.yMax - bounds.yMin || 1);
  let max = 0, points = 0;
  for (let k = 0; k < x.length; k++) {
    if (group[k] === skipGroup) continue;
    const cx = Math.floor((x[k] - bounds.xMin) * sx);
    const cy = Math.floor((bounds.yMax - y[k]) * sy);
    if (cx < 0 || cy < 0 || cx >= width || cy >= height) continue;
    const c = ++counts[cx + cy * width];
    if (c > max) max = c;
    points++;
  }
  return { counts, max, points };
}

/** RGBA pixels: the colour everywhere, alpha from 0.25 (one point) to 0.9 (the densest pixel). */
export function densityPixels(counts: Uint32Array, max: number, rgb: [number, number, number]): Uint8ClampedArray {
  const pixels = new Uint8ClampedArray(counts.length * 4);
  const norm = Math.log1p(max) || 1;
  for (let i = 0; i < counts.length; i++) {
    const c = counts[i];
    if (!c) continue;
    pixels[i * 4] = rgb[0]; pixels[i * 4 + 1] = rgb[1]; pixels[i * 4 + 2] = rgb[2];
    pixels[i * 4 + 3] = Math.round(255 * (0.25 + 0.65 * (Math.log1p(c) / norm)));
  }
  return pixels;
}
