// Flags that follow the probe card, not the wafer: one probe site (or one die of every touchdown
// in a regular lattice) reading off everywhere. Spatially that is no wafer signature at all, and
// it must be recognised before the map is read for shapes, or it looks like a dense random scatter.

import { extentOf } from './dieGrid';
import { countFlagged } from './joinCount';

export interface RepeatingPattern {
  /** 'probe-site' when the site column explains it, 'lattice' when found from x, y alone. */
  kind: 'probe-site' | 'lattice';
  /** Probe site number, for kind 'probe-site'. */
  site?: number;
  /** Lattice step and residue: the dies with x = residueX (mod periodX) and y = residueY (mod periodY). */
  periodX?: number;
  periodY?: number;
  residueX?: number;
  residueY?: number;
  /** Dies in that class, flagged among them, and the flag rate there and elsewhere. */
  classDies: number;
  classFlagged: number;
  rate: number;
  othersRate: number;
  /** 1 for every die of the class. */
  members: Uint8Array;
}

/** A class counts as a repeating pattern when at least this share of its dies is flagged... */
const MIN_CLASS_RATE = 0.3;
/** ...and its rate is at least this many times the rest of the wafer's. */
const MIN_RATE_RATIO = 4;
const MIN_CLASS_FLAGGED = 6;

const LATTICE_PERIODS: readonly (readonly [number, number])[] = [
  [2, 1], [1, 2], [2, 2], [3, 1], [1, 3], [3, 3], [4, 1], [1, 4], [4, 4], [2, 4], [4, 2], [3, 2], [2, 3],
];

interface ClassChoice { key: number; dies: number; flaggedCount: number; rate: number; othersRate: number; score: number }

/** The class with the highest flag rate among per-class counts, if it passes the thresholds. */
function strongestClass(dies: ArrayLike<number>, hits: ArrayLike<number>, n: number, totalFlagged: number): ClassChoice | undefined {
  let best: ClassChoice | undefined;
  for (let k = 0; k < dies.length; k++) {
    if (dies[k] === 0 || hits[k] < MIN_CLASS_FLAGGED) continue;
    const rate = hits[k] / dies[k];
    const rest = n - dies[k];
    const othersRate = rest > 0 ? (totalFlagged - hits[k]) / rest : 0;
    if (rate < MIN_CLASS_RATE || rate < MIN_RATE_RATIO * othersRate) continue;
    const score = rate - othersRate;
    if (!best || score > best.score) best = { key: k, dies: dies[k], flaggedCount: hits[k], rate, othersRate, score };
  }
  return best;
}

/** Every lattice step tried divides 12, so one 12 x 12 table of residues serves them all. */
const RESIDUE_BASE = 12;
const RESIDUE_SHIFT = RESIDUE_BASE * 2 ** 26;

/**
 * Finds one probe site (from `site`, when given) or one lattice class (x mod px, y mod py for
 * steps up to 4) whose dies are flagged far more often than the rest. `residues` (x mod 12 +
 * 12 (y mod 12), from residueClasses) may be passed in when the grid is reused. O(n).
 */
export function findRepeatingPattern(flagged: Uint8Array, x: Int32Array, y: Int32Array, site?: Int32Array, residues = residueClasses(x, y, RESIDUE_BASE, RESIDUE_BASE)): RepeatingPattern | undefined {
  const n = x.length;
  const total = countFlagged(flagged);
  if (total < MIN_CLASS_FLAGGED) return undefined;

  if (site && site.length === n) {
    const maxSite = extentOf(site).max;
    if (maxSite >= 1 && maxSite <= 4096) {
      const dies = new Int32Array(maxSite + 1);
      const hits = new Int32Array(maxSite + 1);
      countByClass(site, flagged, dies, hits);
      const choice = strongestClass(dies, hits, n, total);
      if (choice) {
        return {
          kind: 'probe-site', site: choice.key, classDies: choice.dies, classFlagged: choice.flaggedCount,
          rate: choice.rate, othersRate: choice.othersRate, members: membersOf(site, choice.key),
        };
      }
    }
  }

  const tableDies = new Int32Array(RESIDUE_BASE * RESIDUE_BASE);
  const tableHits = new Int32Array(RESIDUE_BASE * RESIDUE_BASE);
  countByClass(residues, flagged, tableDies, tableHits);
  let best: { choice: ClassChoice; px: number; py: number } | undefined;
  for (const [px, py] of LATTICE_PERIODS) {
    const dies = new Int32Array(px * py);
    const hits = new Int32Array(px * py);
    for (let ry = 0; ry < RESIDUE_BASE; ry++) {
      for (let rx = 0; rx < RESIDUE_BASE; rx++) {
        const k = (rx % px) + px * (ry % py);
        dies[k] += tableDies[rx + RESIDUE_BASE * ry];
        hits[k] += tableHits[rx + RESIDUE_BASE * ry];
      }
    }
    const choice = strongestClass(dies, hits, n, total);
    // Ties go to the smaller lattice, listed first.
    if (choice && (!best || choice.score > best.choice.score + 1e-9)) best = { choice, px, py };
  }
  if (!best) return undefined;
  const { choice, px, py } = best;
  const residueX = choice.key % px;
  const residueY = Math.floor(choice.key / px);
  return {
    kind: 'lattice', periodX: px, periodY: py, residueX, residueY, classDies: choice.dies, classFlagged: choice.flaggedCount,
    rate: choice.rate, othersRate: choice.othersRate, members: membersOf(residueClasses(x, y, px, py), choice.key),
  };
}

// Each loop over the dies is a small function of its own, so V8 optimises it whole.

/** Class number (x mod px) + px (y mod py) per die, px and py dividing 12; a large multiple of 12 added first keeps remainders non-negative. */
export function residueClasses(x: Int32Array, y: Int32Array, px: number, py: number): Uint8Array {
  const out = new Uint8Array(x.length); // fewer than 144 classes
  for (let i = 0; i < x.length; i++) out[i] = ((x[i] + RESIDUE_SHIFT) % px) + px * ((y[i] + RESIDUE_SHIFT) % py);
  return out;
}

function countByClass(classes: Int32Array | Uint8Array, flagged: Uint8Array, dies: Int32Array, hits: Int32Array): void {
  for (let i = 0; i < classes.length; i++) {
    const k = classes[i];
    if (k < 0 || k >= dies.length) continue;
    dies[k]++;
    if (flagged[i]) hits[k]++;
  }
}

function membersOf(classes: Int32Array | Uint8Array, key: number): Uint8Array {
  const members = new Uint8Array(classes.length);
  for (let i = 0; i < classes.length; i++) members[i] = classes[i] === key ? 1 : 0;
  return members;
}
