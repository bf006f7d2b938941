// Writes the demo lot and its truth file to a folder: sample-data/ is made with this, via
// `npm run demo-data`.

import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_LOT_OPTIONS, lotCsvChunks, generateLot, type LotOptions } from '../core/generator';

export const DEMO_CSV_NAME = 'demo-lot.csv';
export const DEMO_TRUTH_NAME = 'demo-lot.truth.json';

export interface DemoLotPaths {
  csv: string;
  truth: string;
  /** Dies per wafer and total rows written. */
  diesPerWafer: number;
  rows: number;
}

/**
 * Generates the lot described by options (the committed demo scenario by default) and writes
 * `demo-lot.csv` and `demo-lot.truth.json` into dir, creating it if needed.
 */
export function writeDemoLot(dir: string, options: LotOptions = DEMO_LOT_OPTIONS): DemoLotPaths {
  mkdirSync(dir, { recursive: true });
  const generated = generateLot(options);
  const csv = join(dir, DEMO_CSV_NAME);
  const truth = join(dir, DEMO_TRUTH_NAME);

  const fd = openSync(csv, 'w');
  try {
    for (const chunk of lotCsvChunks(generated)) writeSync(fd, chunk);
  } finally {
    closeSync(fd);
  }

  const { planted, ...about } = generated.truth;
  const document = {
    note:
      'Invented demo scenario: no real company, fab, product or person. Lists what the generator planted; ' +
      'flags from an analysis are statistical evidence, not a disposition.',
    ...about,
    layout: {
      waferDiameterMm: generated.layout.waferDiameterMm,
      edgeExclusionMm: generated.layout.edgeExclusionMm,
      usableRadiusMm: generated.layout.usableRadiusMm,
      dieWidthMm: generated.layout.dieWidthMm,
      dieHeightMm: generated.layout.dieHeightMm,
      sitesX: generated.layout.sitesX,
      sitesY: generated.layout.sitesY,
      shotX: generated.layout.shotX,
      shotY: generated.layout.shotY,
      orientation: generated.layout.orientation,
      diesPerWafer: generated.layout.x.length,
    },
    planted: planted.map(({ lot, wafer, x, y, site, mechanism, shape, device, magnitude, excursion }) => ({
      lot, wafer, x, y, site, mechanism, shape, device, magnitude: Number(magnitude.toPrecision(4)), excursion,
    })),
  };
  writeFileSync(truth, truthJson(document));

  const diesPerWafer = generated.layout.x.length;
  return { csv, truth, diesPerWafer, rows: diesPerWafer * generated.wafers.length };
}

/** Pretty JSON with one planted die per line, so the file stays short and diffs stay readable. */
function truthJson(document: { planted: unknown[] } & Record<string, unknown>): string {
  const { planted, ...rest } = document;
  const head = JSON.stringify(rest, null, 2).replace(/\n}$/, '');
  const rows = planted.map((die) => '    ' + JSON.stringify(die)).join(',\n');
  return `${head},\n  "planted": [\n${rows}\n  ]\n}\n`;
}
