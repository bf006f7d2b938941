import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openDatabase, type Db } from '../../src/node/store/database';
import { listLots, loadLot, loadWafer } from '../../src/node/store/repository';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { importAnyFile, previewFile } from '../../src/node/importAny';
import { listMappings, saveMapping } from '../../src/node/importMappings';
import { scratchSpace } from '../support/scratch';

const { write } = scratchSpace();

const count = (db: Db, table: string) => (db.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;

describe('messy delimited files', () => {
  it('reads a BOM, CRLF, comments, quoted fields, a repeated header, NA and semicolons', async () => {
    const db = openDatabase(':memory:');
    const text = '\uFEFF# exported by a tester\r\n"LOT_ID";"Slot";"DieX";"DieY";"Site";"Ioff_n [pA]";"ION_N (uA)"\r\n' +
      '"Q 1";3;0;0;1;12,5;800\r\n' + // "12,5" is not a number here (decimal comma): rejected with its line
      '"Q 1";3;1;0;2;13.5;NaN\r\n' +
      '// a note\r\n' +
      '"LOT_ID";"Slot";"DieX";"DieY";"Site";"Ioff_n [pA]";"ION_N (uA)"\r\n' +
      '"Q 1";3;2;0;1;;805\r\n';
    const result = await importDelimitedFile(db, write('messy.csv', text));
    expect(result).toMatchObject({ status: 'imported', lots: ['Q 1'], wafers: 1, rows: 2, rejected: 1, rowsRead: 3, rejectedBy: { 'not a number': 1 } });
    expect(result.messages.join('\n')).toMatch(/1 repeated header line/);
    expect(result.messages.join('\n')).toMatch(/Line 3 rejected: Ioff_n \[pA\] "12,5" is not a number/);
    const w = loadWafer(db, 'Q 1', '3');
    expect(Array.from(w.x)).toEqual([1, 2]);
    expect(w.values.Ioff_n[0]).toBeCloseTo(13.5e-12, 25);
    expect(w.values.Ion_n[0]).toBeNaN();
    expect(w.values.Ioff_n[1]).toBeNaN();
  });

  // Oracle: the string path (Number() on each field, RFC 4180 quoting) versus the byte fast path,
  // on plain and on fully quoted text: all four imports must store the same doubles.
  it('stores identical values through the byte fast path and the string path', async () => {
    let s = 7;
    const rnd = () => { s = (s * 1103515245 + 12345) % 2147483648; return s / 2147483648; };
    const rows: string[][] = [];
    for (let i = 0; i < 3000; i++) {
      rows.push(['L', String(1 + (i % 3)), String(i % 60), String(Math.floor(i / 60)), String(1 + (i % 4)),
        (rnd() * 100).toPrecision(1 + Math.floor(rnd() * 16)), (-rnd() * 1e-3).toExponential(Math.floor(rnd() * 12)), rnd() < 0.05 ? '' : String(0.3 + rnd() / 10)]);
    }
    const header = 'Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_p [A],Vtsat_n [V]';
    const plain = [header, ...rows.map((r) => r.join(','))].join('\n');
    const quoted = [header, ...rows.map((r) => r.map((f) => `"${f}"`).join(','))].join('\n');
    const a = openDatabase(':memory:');
    const b = openDatabase(':memory:');
    const c = openDatabase(':memory:');
    const d = openDatabase(':memory:');
    await importDelimitedFile(a, write('plain.csv', plain));
    await importDelimitedFile(b, write('plain2.csv', plain), { fastPath: false });
    await importDelimitedFile(c, write('quoted.csv', quoted));
    await importDelimitedFile(d, write('quoted2.csv', quoted), { fastPath: false });
    expect(loadLot(a, 'L')).toEqual(loadLot(b, 'L'));
    expect(loadLot(c, 'L')).toEqual(loadLot(b, 'L'));
    expect(loadLot(d, 'L')).toEqual(loadLot(b, 'L'));
    expect(loadLot(a, 'L').some((f) => Array.from(f.values.Vtsat_n).some(Number.isNaN))).toBe(true);
    expect(loadWafer(a, 'L', '1').values.Ion_p[0]).toBe(Number(rows[0][6]));
  });

  it('gives the same result on both paths for awkward quoting: delimiters, doubled quotes and line breaks inside quotes', async () => {
    const text = [
      'Lot,Wafer,X,Y,,Ioff_n [pA]', // a column with an empty header is ignored
      '"A,1",1,0,0,plain,5',
      '"A,1","1","1","0","say ""hi""","6"',
      '"A,1",1,2,0,"two',
      'lines",7',
      '"A,1",1,3,0,x,"1,5"',
      '"A,1",1,4,0,"",""',
      '"A,1",1,5,0,ok"quote,8',
      '"A,1",1,6,0,z,9',
    ].join('\r\n');
    const fast = openDatabase(':memory:');
    const slow = openDatabase(':memory:');
    const r1 = await importDelimitedFile(fast, write('q1.csv', text));
    const r2 = await importDelimitedFile(slow, write('q2.csv', text), { fastPath: false });
    expect(loadLot(fast, 'A,1')).toEqual(loadLot(slow, 'A,1'));
    expect({ ...r1, seconds: 0, hash: '', file: '' }).toEqual({ ...r2, seconds: 0, hash: '', file: '' });
    expect(r1.messages.join('\n')).toMatch(/Line 6 rejected: Ioff_n \[pA\] "1,5" is not a number/);
    expect(r1).toMatchObject({ rows: 6, rejected: 1 });
    expect(Array.from(loadWafer(fast, 'A,1', '1').values.Ioff_n)).toEqual([5e-12, 6e-12, 7e-12, NaN, 8e-12, 9e-12]);
  });

  it('keeps the later row of a die even when one of the two takes the string path', async () => {
    const db = openDatabase(':memory:');
    await importDelimitedFile(db, write('d.csv', 'Wafer,X,Y,Ioff_n\n1,0,0,NA\n1,0,0,5e-12\n1,1,0,6e-12\n1,1,0,NA\n'));
    expect(Array.from(loadWafer(db, 'd', '1').values.Ioff_n)).toEqual([5e-12, NaN]);
  });

  it('reads empty fields at the end of CRLF lines as missing values', async () => {
    const db = openDatabase(':memory:');
    const result = await importDelimitedFile(db, write('e.csv', 'Wafer,X,Y,Ioff_n,Vtsat_n\r\n1,0,0,5e-12,\r\n1,1,0,,0.3\r\n1,2,0,6e-12,0.31'));
    expect(result.rows).toBe(3);
    const w = loadWafer(db, 'e', '1');
    expect(Array.from(w.values.Ioff_n)).toEqual([5e-12, NaN, 6e-12]);
    expect(Array.from(w.values.Vtsat_n)).toEqual([NaN, 0.3, 0.31]);
  });

  it('imports the long layout (one row per die and test) from a file', async () => {
    const db = openDatabase(':memory:');
    const result = await importDelimitedFile(db, write('long.tsv', 'Lot\tWafer\tX\tY\tParameter\tResult\tUnits\nL\t1\t0\t0\tIoff_n\t20\tpA\nL\t1\t0\t0\tVtsat_n\t410\tmV\n'));
    expect(result).toMatchObject({ layout: 'long', rows: 2 });
    const w = loadWafer(db, 'L', '1');
    expect(w.values.Vtsat_n[0]).toBeCloseTo(0.41, 12);
  });
});

describe('one lot over several files', () => {
  const header = 'Lot,Wafer,X,Y,Ioff_n [pA]';
  it('merges a wafer split over two files when no die overlaps, and records both files', async () => {
    const db = openDatabase(':memory:');
    await importDelimitedFile(db, write('part1.csv', `${header}\nM,1,0,0,1\nM,1,1,0,2\nM,2,0,0,3\n`));
    const second = await importDelimitedFile(db, write('part2.csv', `${header}\nM,2,1,0,4\nM,3,0,0,5\n`));
    expect(second.messages.join('\n')).toMatch(/Wafer 2 of lot M: 1 dies added to the 1 already stored from part1\.csv/);
    expect(listLots(db)).toMatchObject([{ lot: 'M', wafers: 3, dies: 5 }]);
    expect(Array.from(loadWafer(db, 'M', '2').values.Ioff_n)).toEqual([3e-12, 4e-12]);
    expect(count(db, 'wafer_sources')).toBe(4);
  });

  it('refuses the whole second file, storing nothing of it, when a die is already stored from another file', async () => {
    const db = openDatabase(':memory:');
    await importDelimitedFile(db, write('first.csv', `${header}\nM,1,0,0,1\nM,1,1,0,2\n`));
    const before = JSON.stringify(loadLot(db, 'M'));
    await expect(importDelimitedFile(db, write('again.csv', `${header}\nM,9,0,0,7\nM,1,1,0,8\n`))).rejects.toThrow(/Wafer 1 of lot M is already stored \(from first\.csv\) and 1 of its dies/);
    expect(JSON.stringify(loadLot(db, 'M'))).toBe(before);
    expect(count(db, 'imports')).toBe(1);
    expect(listLots(db)[0].wafers).toBe(1);
  });

  it('merges a wafer the file brings back after it was written early to bound memory', async () => {
    const db = openDatabase(':memory:');
    const rows = [header];
    for (let i = 0; i < 20; i++) rows.push(`E,1,${i},0,1`);
    for (let i = 0; i < 20; i++) rows.push(`E,2,${i},0,2`);
    rows.push('E,1,20,0,3', 'E,1,0,0,9'); // wafer 1 again: one new die and one repeated die (later wins)
    const result = await importDelimitedFile(db, write('back.csv', rows.join('\n')), { maxHeldCells: 30 });
    expect(result).toMatchObject({ wafers: 2, rows: 42, duplicatesReplaced: 0 });
    const w = loadWafer(db, 'E', '1');
    expect(w.x.length).toBe(21);
    expect(w.values.Ioff_n[0]).toBe(9e-12);
  });
});

describe('saved mappings', () => {
  it('applies a saved mapping to a file with the same headers and says so', async () => {
    const db = openDatabase(':memory:');
    const path = write('odd.csv', 'WAF,COLX,ROWY,LEAK_NA\n1,0,0,2\n1,1,0,3\n');
    const preview = previewFile(db, path, undefined);
    expect(preview.errors.length).toBeGreaterThan(0);
    const mapping = {
      ...preview.mapping,
      columns: [{ header: 'WAF', role: 'wafer' as const }, { header: 'COLX', role: 'x' as const }, { header: 'ROWY', role: 'y' as const }, { header: 'LEAK_NA', role: 'measurement' as const, name: 'Ioff_n', unit: 'nA' }],
    };
    const corrected = previewFile(db, path, mapping);
    expect(corrected.errors).toEqual([]);
    expect(corrected.columns[3]).toMatchObject({ name: 'Ioff_n', unit: 'A', scale: 1e-9, samples: ['2', '3'] });
    // The preview's own mapping (what a view sends back after corrections) reproduces the corrections.
    saveMapping(db, 'odd tester', corrected.mapping);
    expect(listMappings(db).map((m) => m.name)).toEqual(['odd tester']);
    expect(previewFile(db, path, undefined).appliedMapping).toBe('odd tester');
    const result = await importAnyFile(db, path);
    expect(result.mapping).toBe('odd tester');
    expect(loadWafer(db, 'odd', '1').values.Ioff_n[1]).toBeCloseTo(3e-9, 20);
  });
});
