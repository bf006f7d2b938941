// Synthetic flag maps with a known signature, for testing and benchmarking the labeller. Uses the
// demo generator's wafer layout and excursion shapes (src/core/generator) and adds the two shapes
// it has no kind for (donut, near-full), holes in the pattern and a random background.

import { layoutWafer, type DieLayout } from '../generator/layout';
import type { Random } from '../generator/random';
import { selectDies, type ExcursionShape } from '../generator/shapes';
import type { SignatureLabel } from './signature';

export interface SynthOptions {
  /** Die width in mm; the height is the width times 0.8..1.25 drawn at random. */
  dieSizeMm: number;
  waferDiameterMm?: number;
  /** Background flag probability per die; drawn from 0.2 % .. 3 % when not given. */
  noise?: number;
  /** A layout to plant on (the wafers of one lot share it); drawn from dieSizeMm when not given. */
  layout?: DieLayout;
}

export interface SynthesisedWafer {
  label: SignatureLabel;
  layout: DieLayout;
  x: Int32Array;
  y: Int32Array;
  site: Int32Array;
  flagged: Uint8Array;
  /** The planted shape in words, for test failure messages. */
  description: string;
}

const DEGREE = Math.PI / 180;

function fillDies(flagged: Uint8Array, dies: Iterable<number>, fill: number, random: Random): void {
  for (const d of dies) if (random.next() < fill) flagged[d] = 1;
}

function keep(layout: DieLayout, test: (r: number) => boolean): number[] {
  const out: number[] = [];
  const radius = layout.usableRadiusMm;
  for (let i = 0; i < layout.x.length; i++) if (test(Math.hypot(layout.centreXMm[i], layout.centreYMm[i]) / radius)) out.push(i);
  return out;
}

function drawLayout(options: SynthOptions, random: Random): DieLayout {
  const w = options.dieSizeMm;
  const h = w * random.uniform(0.8, 1.25);
  return layoutWafer({
    dieWidthMm: w,
    dieHeightMm: h,
    waferDiameterMm: options.waferDiameterMm ?? 300,
    gridOffsetXMm: random.uniform(-w / 2, w / 2),
    gridOffsetYMm: random.uniform(-h / 2, h / 2),
  });
}

/** One wafer with the given signature at a random size, place and angle, plus background noise. */
export function synthesiseWafer(label: SignatureLabel, random: Random, options: SynthOptions): SynthesisedWafer {
  const layout = options.layout ?? drawLayout(options, random);
  const n = layout.x.length;
  const R = layout.usableRadiusMm;
  const flagged = new Uint8Array(n);
  const fill = random.uniform(0.8, 1);
  const plant = (shape: ExcursionShape, share = fill) => fillDies(flagged, selectDies(shape, layout, random), share, random);
  let description: string = label;

  switch (label) {
    case 'center': {
      const radiusFraction = random.uniform(0.2, 0.45);
      plant({ kind: 'center', radiusFraction });
      description = `center r ${radiusFraction.toFixed(2)}`;
      break;
    }
    case 'donut': {
      const inner = random.uniform(0.25, 0.4);
      const outer = Math.min(0.75, inner + random.uniform(0.2, 0.32));
      fillDies(flagged, keep(layout, (r) => r >= inner && r <= outer), fill, random);
      description = `donut ${inner.toFixed(2)}-${outer.toFixed(2)}`;
      break;
    }
    case 'edge-ring': {
      const innerFraction = random.uniform(0.74, 0.88);
      plant({ kind: 'edge-ring', innerFraction });
      description = `edge-ring from ${innerFraction.toFixed(2)}`;
      break;
    }
    case 'edge-loc': {
      const shape = { kind: 'edge-loc', innerFraction: random.uniform(0.72, 0.88), angleDeg: random.uniform(0, 360), spanDeg: random.uniform(40, 120) } as const;
      plant(shape);
      description = `edge-loc from ${shape.innerFraction.toFixed(2)} at ${shape.angleDeg.toFixed(0)} deg, ${shape.spanDeg.toFixed(0)} deg wide`;
      break;
    }
    case 'loc': {
      const radius = random.uniform(0.1, 0.2);
      const at = random.uniform(0.12 + radius, 0.85 - radius);
      const angle = random.uniform(0, 360) * DEGREE;
      plant({ kind: 'loc', xMm: at * R * Math.cos(angle), yMm: at * R * Math.sin(angle), radiusMm: radius * R });
      description = `loc r ${radius.toFixed(2)} at ${at.toFixed(2)}`;
      break;
    }
    case 'scratch': {
      const at = random.uniform(0, 0.4) * R;
      const where = random.uniform(0, 360) * DEGREE;
      const shape = {
        kind: 'scratch', xMm: at * Math.cos(where), yMm: at * Math.sin(where), angleDeg: random.uniform(0, 180),
        lengthMm: random.uniform(0.35, 0.9) * 2 * R, widthMm: random.uniform(0.1, 1),
      } as const;
      plant(shape, 1);
      description = `scratch ${shape.lengthMm.toFixed(0)} mm at ${shape.angleDeg.toFixed(0)} deg`;
      break;
    }
    case 'random': {
      const share = random.uniform(0.1, 0.3);
      plant({ kind: 'random', count: Math.round(share * n) }, 1);
      description = `random ${(100 * share).toFixed(0)} %`;
      break;
    }
    case 'near-full':
      fillDies(flagged, layout.x.keys(), random.uniform(0.8, 0.97), random);
      description = 'near-full';
      break;
    case 'none':
      // Half the quiet wafers carry a probe-site bias: one site of the 2 x 2 touchdown reads off everywhere.
      if (random.next() < 0.5) {
        const site = random.int(1, layout.sitesX * layout.sitesY);
        plant({ kind: 'site', site }, random.uniform(0.7, 1));
        description = `none with probe site ${site}`;
      }
      break;
  }
  const noise = options.noise ?? random.uniform(0.002, 0.03);
  for (let i = 0; i < n; i++) if (random.next() < noise) flagged[i] = 1;
  return { label, layout, x: layout.x, y: layout.y, site: layout.site, flagged, description: `${description}, noise ${(100 * noise).toFixed(1)} %` };
}
