// WCR geometry into the spatial analysis' terms. Field meanings from the STDF V4 specification's
// WCR table (WF_UNITS 1 inches, 2 cm, 3 mm, 4 mils; WF_FLAT and POS_X/POS_Y letters; -32768 for a
// missing CENTER_X/Y); 1 inch = 25.4 mm and 1 mil = 0.001 inch exactly (international yard and
// pound agreement, 1959).
import { describe, expect, it } from 'vitest';
import { geometryFromWcr } from '../../../src/core/spatial';

describe('geometryFromWcr', () => {
  it('converts sizes to mm from every WF_UNITS unit', () => {
    const inches = geometryFromWcr({ waferSize: 12, dieWidth: 0.25, dieHeight: 0.2, units: 'in' });
    expect(inches.waferDiameterMm).toBeCloseTo(304.8, 10);
    expect(inches.dieWidthMm).toBeCloseTo(6.35, 10);
    expect(inches.dieHeightMm).toBeCloseTo(5.08, 10);
    const cm = geometryFromWcr({ waferSize: 20, dieWidth: 0.5, units: 'cm' });
    expect(cm.waferDiameterMm).toBeCloseTo(200, 10);
    expect(cm.dieWidthMm).toBeCloseTo(5, 10);
    expect(geometryFromWcr({ waferSize: 300, units: 'mm' })).toMatchObject({ waferDiameterMm: 300 });
    expect(geometryFromWcr({ dieWidth: 250, units: 'mil' }).dieWidthMm).toBeCloseTo(6.35, 12);
  });
  it('maps the flat or notch side and the axis directions', () => {
    expect(geometryFromWcr({ flat: 'D', posX: 'R', posY: 'U' })).toEqual({ notch: 'bottom', xPositive: 'right', yPositive: 'up' });
    expect(geometryFromWcr({ flat: 'L', posX: 'L', posY: 'D' })).toEqual({ notch: 'left', xPositive: 'left', yPositive: 'down' });
  });
  it('leaves out what the record does not give, so it is inferred from the grid', () => {
    expect(geometryFromWcr({ centerX: -32768, centerY: 4, waferSize: 300 })).toEqual({ centreY: 4 });
  });
});
