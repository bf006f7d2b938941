// The colour ramp of the wafer map: viridis, a perceptually uniform ramp whose lightness rises
// steadily from dark blue-violet to yellow and that stays readable with the common colour-vision
// deficiencies. Control points are 17 entries (index 0, 16, 32, ... 240, 255) of the published
// 256-entry table `_viridis_data` by Nathaniel J. Smith, Stefan van der Walt and Eric Firing
// (matplotlib's lib/matplotlib/_cm_listed.py, released CC0), interpolated linearly in sRGB.

/** [position 0..1, r, g, b] with r, g, b in 0..1. */
const VIRIDIS_CONTROL_POINTS: readonly (readonly [number, number, number, number])[] = [
  [0 / 255, 0.267004, 0.004874, 0.329415],
  [16 / 255, 0.282327, 0.094955, 0.417331],
  [32 / 255, 0.278826, 0.175490, 0.483397],
  [48 / 255, 0.258965, 0.251537, 0.524736],
  [64 / 255, 0.229739, 0.322361, 0.545706],
  [80 / 255, 0.199430, 0.387607, 0.554642],
  [96 / 255, 0.172719, 0.448791, 0.557885],
  [112 / 255, 0.149039, 0.508051, 0.557250],
  [128 / 255, 0.127568, 0.566949, 0.550556],
  [144 / 255, 0.120638, 0.625828, 0.533488],
  [160 / 255, 0.157851, 0.683765, 0.501686],
  [176 / 255, 0.246070, 0.738910, 0.452024],
  [192 / 255, 0.369214, 0.788888, 0.382914],
  [208 / 255, 0.515992, 0.831158, 0.294279],
  [224 / 255, 0.678489, 0.863742, 0.189503],
  [240 / 255, 0.845561, 0.887322, 0.099702],
  [255 / 255, 0.993248, 0.906157, 0.143936],
];

export type Rgb = [number, number, number];

/** The ramp's colour at t in [0, 1] (clamped), as 0..255 integers. */
export function viridis(t: number): Rgb {
  const clamped = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0;
  let upper = 1;
  while (upper < VIRIDIS_CONTROL_POINTS.length - 1 && VIRIDIS_CONTROL_POINTS[upper][0] < clamped) upper++;
  const a = VIRIDIS_CONTROL_POINTS[upper - 1];
  const b = VIRIDIS_CONTROL_POINTS[upper];
  const f = (clamped - a[0]) / (b[0] - a[0]);
  return [
    Math.round((a[1] + (b[1] - a[1]) * f) * 255),
    Math.round((a[2] + (b[2] - a[2]) * f) * 255),
    Math.round((a[3] + (b[3] - a[3]) * f) * 255),
  ];
}

/** Number of colour steps the map uses; 256 is below what the eye separates on a ramp. */
export const RAMP_STEPS = 256;

/** The ramp sampled into RAMP_STEPS RGBA entries, for fast per-die pixel writes. */
export function rampTable(steps = RAMP_STEPS): Uint8ClampedArray {
  const table = new Uint8ClampedArray(steps * 4);
  for (let i = 0; i < steps; i++) {
    const [r, g, b] = viridis(i / (steps - 1));
    table.set([r, g, b, 255], i * 4);
  }
  return table;
}

export function rgbToHex([r, g, b]: Rgb): string {
  return `#${[r, g, b].map((v) => v.toString(16).padStart(2, '0')).join('')}`;
}

/** CSS linear-gradient stops for a legend bar, left (t = 0) to right (t = 1). */
export function rampGradientCss(stops = 9): string {
  const parts: string[] = [];
  for (let i = 0; i < stops; i++) {
    const t = i / (stops - 1);
    parts.push(`${rgbToHex(viridis(t))} ${(t * 100).toFixed(1)}%`);
  }
  return `linear-gradient(to right, ${parts.join(', ')})`;
}
