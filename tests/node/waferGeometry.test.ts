// The spatial step gets each wafer's geometry from its STDF WCR record (written here from the
// specification's record table by tests/support), corrected by the orientation and shot size the
// user saved; without either, nothing is assumed and the die grid decides.
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase } from '../../src/node/store/database';
import { importAnyFile } from '../../src/node/importAny';
import { loadLot, setSetting } from '../../src/node/store/repository';
import { analyzeStoredLot, waferGeometryOf } from '../../src/node/analysisStore';
import { inventedWafer, writeStdfLot } from '../support/stdfLot';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('wafer geometry for the spatial step', () => {
  it('comes from the WCR record, and the user\'s saved orientation and shot size override it', async () => {
    const db = openDatabase(':memory:');
    const path = join(dir, 'geo.stdf');
    writeFileSync(path, writeStdfLot('GEO1', [{ id: 'W1', dies: inventedWafer(5, 7) }], true));
    await importAnyFile(db, path);
    const [frame] = loadLot(db, 'GEO1');
    // The fixture's WCR: 300 mm, 1 x 1 mm dies in mm units, flat down, centre (3, 3), x right, y down.
    expect(waferGeometryOf(db)(frame)).toEqual({ waferDiameterMm: 300, dieWidthMm: 1, dieHeightMm: 1, notch: 'bottom', xPositive: 'right', yPositive: 'down', centreX: 3, centreY: 3 });
    setSetting(db, 'display', JSON.stringify({ notch: 'up', yUp: true, shotColumns: 3, shotRows: 2, shotOriginX: 0, shotOriginY: 0 }));
    expect(waferGeometryOf(db)(frame)).toMatchObject({ waferDiameterMm: 300, notch: 'top', yPositive: 'up', shotX: 3, shotY: 2 });
    expect(analyzeStoredLot(db, 'GEO1').wafers[0].pattern?.label).toBeDefined();
    db.close();
  });
  it('is empty for a delimited file with no saved settings', async () => {
    const db = openDatabase(':memory:');
    const path = join(dir, 'plain.csv');
    writeFileSync(path, 'Lot,Wafer,X,Y,Ioff_n [pA]\nP1,1,0,0,20\nP1,1,1,0,21\n');
    await importAnyFile(db, path);
    expect(waferGeometryOf(db)(loadLot(db, 'P1')[0])).toEqual({});
    db.close();
  });
});
