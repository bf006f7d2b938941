import { describe, expect, it } from 'vitest';
import { DelimitedReader, FrameBuilder, planHeader, planWithMapping, previewRecords, mappingProblems, mergeParts, overlappingDies } from '../../../src/core/import';

function build(text: string, options = {}) {
  const reader = new DelimitedReader();
  const records = [...reader.push(text), ...reader.end()];
  const plan = planHeader(records[0].fields);
  const b = new FrameBuilder(plan, 'FILE', options);
  for (const r of records.slice(1)) b.add(r.line, r.fields);
  return { plan, b, frames: () => b.frames() };
}

describe('header variants', () => {
  it('recognises the common spellings of lot, wafer, x, y and site in any case', () => {
    // Header words from DOMAIN.md "Data that arrives" (common practice).
    const plan = planHeader(['LotID', 'SLOT', 'Col', 'Row', 'Head/Site', 'ioff_n_nA']);
    expect(plan.errors).toEqual([]);
    expect(plan.columns.map((c) => c.role)).toEqual(['lot', 'wafer', 'x', 'y', 'site', 'measurement']);
    expect(plan.columns[5]).toMatchObject({ name: 'Ioff_n', unit: 'A', scale: 1e-9 });
  });
  it('reads semicolon files with units in parentheses and keeps the later row of a repeated die', () => {
    const { b, frames } = build('Wafer;X;Y;Ion_n (mA)\n1;0;0;0.5\n1;0;0;0.6\n');
    expect(b.report.duplicatesReplaced).toBe(1);
    expect(frames()[0].values.Ion_n[0]).toBeCloseTo(0.6e-3, 15);
  });
});

describe('row validation', () => {
  it('rejects a zero current, an infinite value and a die outside the grid, with line numbers and kinds', () => {
    const text = ['Wafer,X,Y,Ioff_n [pA],Vtsat_n [V]', '1,0,0,5,0.4', '1,1,0,0,0.4', '1,2,0,5,Infinity', '1,40,0,5,0.4', '1,3,0,5,0'].join('\n');
    const { b, frames } = build(text, { grid: { xMin: -10, xMax: 10, yMin: -10, yMax: 10 } });
    expect(b.report.rejected.map((r) => r.line)).toEqual([3, 4, 5]);
    expect(b.report.rejectedBy).toEqual({ 'zero current': 1, 'not finite': 1, 'outside the grid': 1 });
    // A voltage of 0 V is a possible reading; only currents of exactly 0 A are refused.
    expect(Array.from(frames()[0].values.Vtsat_n)).toEqual([0.4, 0]);
  });
});

describe('long layout (one row per die and test)', () => {
  it('pivots test rows into one column per test, with units from a unit column', () => {
    const text = ['Lot,Wafer,X,Y,Site,Test,Value,Unit', 'L,1,0,0,1,Ioff_n,20,pA', 'L,1,0,0,1,Ion_n,700,uA', 'L,1,1,0,2,Ioff_n,25,pA', 'L,1,1,0,2,Ion_n,NA,uA'].join('\n');
    const { plan, b, frames } = build(text);
    expect(plan.layout).toBe('long');
    const [f] = frames();
    expect(f.params).toEqual([{ name: 'Ioff_n', unit: 'A' }, { name: 'Ion_n', unit: 'A' }]);
    expect(Array.from(f.x)).toEqual([0, 1]);
    expect(Array.from(f.site)).toEqual([1, 2]);
    expect(f.values.Ioff_n[1]).toBeCloseTo(25e-12, 24);
    expect(f.values.Ion_n[1]).toBeNaN();
    expect(b.report.rowsStored).toBe(4);
  });
  it('rejects a test given in two incompatible units and names the first line', () => {
    const text = ['Wafer,X,Y,Test,Value,Unit', '1,0,0,Leak,20,nA', '1,1,0,Leak,0.3,V', '1,2,0,Isb,0.3,V'].join('\n');
    const { b } = build(text);
    expect(b.report.rejected[0]).toEqual({ line: 3, reason: 'mixed units: Leak was given in nA on line 2, here in V' });
    // A known parameter in the wrong kind of unit is refused too.
    expect(b.report.rejected[1]).toEqual({ line: 4, reason: 'Isb is measured in A, but the header says V.' });
  });
  it('converts compatible units of one test to the base unit', () => {
    const { frames } = build(['Wafer,X,Y,Test,Value,Unit', '1,0,0,Isb,20,nA', '1,1,0,Isb,30000,pA'].join('\n'));
    const v = frames()[0].values.Isb;
    expect(v[0]).toBeCloseTo(20e-9, 20);
    expect(v[1]).toBeCloseTo(30e-9, 20);
  });
});

describe('memory bound', () => {
  it('hands out the least recently used wafer early when too many values are held', () => {
    const rows = ['Wafer,X,Y,Ioff_n'];
    for (const w of [1, 2, 3]) for (let i = 0; i < 10; i++) rows.push(`${w},${i},0,1e-12`);
    const { b, frames } = build(rows.join('\n'), { maxHeldCells: 50 });
    const early = b.takeEvicted();
    expect(early.map((f) => f.wafer)).toEqual(['1', '2']);
    expect(frames().map((f) => f.wafer)).toEqual(['3']);
  });
});

describe('mappings', () => {
  const headers = ['LOT', 'WF', 'XX', 'YY', 'Leak [nA]', 'junk'];
  it('lets the user give roles, names and units to columns the inference missed', () => {
    expect(planHeader(headers).errors.join(' ')).toMatch(/No die X column/);
    const plan = planWithMapping(headers, {
      columns: [{ header: 'xx', role: 'x' }, { header: 'YY', role: 'y' }, { header: 'Leak [nA]', role: 'measurement', name: 'Ioff_n' }, { header: 'junk', role: 'ignored' }],
    });
    expect(plan.errors).toEqual([]);
    expect(plan.columns[4]).toMatchObject({ role: 'measurement', name: 'Ioff_n', unit: 'A', scale: 1e-9 });
    expect(plan.columns[5].role).toBe('ignored');
  });
  it('previews the columns with samples and returns a mapping that reproduces the plan', () => {
    const reader = new DelimitedReader();
    const records = reader.push('Lot\tWafer\tX\tY\tIon_p (uA)\nA\t1\t0\t0\t-400\nA\t1\t1\t0\t-410\n');
    const preview = previewRecords(records, reader.delimiter, undefined);
    expect(preview.delimiter).toBe('\t');
    expect(preview.columns[4]).toMatchObject({ role: 'measurement', name: 'Ion_p', unit: 'A', scale: 1e-6, samples: ['-400', '-410'] });
    const again = planWithMapping(records[0].fields, preview.mapping);
    expect(again.columns).toEqual(planHeader(records[0].fields).columns);
    expect(mappingProblems(preview.mapping)).toEqual([]);
  });
  it('lists the tests of a long-layout file with their units, and applies test corrections', () => {
    const reader = new DelimitedReader();
    const records = reader.push('Wafer,X,Y,Test,Value,Unit\n1,0,0,Ioff_n,20,pA\n1,0,0,LKG,3,nA\n1,1,0,Ioff_n,21,pA\n');
    const preview = previewRecords(records, reader.delimiter, { tests: [{ test: 'lkg', name: 'Isb' }] });
    expect(preview.layout).toBe('long');
    expect(preview.tests).toEqual([
      { test: 'Ioff_n', name: 'Ioff_n', unit: 'A', scale: 1e-12, count: 2 },
      { test: 'LKG', name: 'Isb', unit: 'A', scale: 1e-9, count: 1 },
    ]);
    expect(preview.mapping.tests).toEqual([{ test: 'Ioff_n', name: 'Ioff_n' }, { test: 'LKG', name: 'Isb' }]);
  });
  it('says what is wrong with a malformed mapping', () => {
    expect(mappingProblems({ columns: [{ header: 'a', role: 'boss' }], grid: { xMin: 3, xMax: 1, yMin: 0, yMax: 1 } })).toHaveLength(2);
  });
});

describe('merging parts of one wafer', () => {
  const part = (xs: number[], param: string, v: number) => ({
    frame: { lot: 'L', wafer: '1', x: Int32Array.from(xs), y: new Int32Array(xs.length), site: new Int32Array(xs.length), params: [{ name: param, unit: 'A' }], values: { [param]: new Float64Array(xs.length).fill(v) } },
  });
  it('appends dies that do not overlap and fills parameters a part lacks with NaN', () => {
    const merged = mergeParts(part([0, 1], 'Ioff_n', 1), part([2], 'Ion_n', 2)).frame;
    expect(Array.from(merged.x)).toEqual([0, 1, 2]);
    expect(Array.from(merged.values.Ioff_n)).toEqual([1, 1, NaN]);
    expect(Array.from(merged.values.Ion_n)).toEqual([NaN, NaN, 2]);
    expect(overlappingDies(part([0, 1], 'a', 0).frame, part([1, 5], 'a', 0).frame)).toBe(1);
  });
  it('gives an overlapping die the newer values', () => {
    const merged = mergeParts(part([0, 1], 'Ioff_n', 1), part([1], 'Ioff_n', 9)).frame;
    expect(Array.from(merged.values.Ioff_n)).toEqual([1, 9]);
  });
});
