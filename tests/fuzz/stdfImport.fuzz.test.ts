// Property-based fuzzing (fast-check) of the STDF V4 importer: a valid invented lot written from
// the specification's record tables (tests/support), then damaged by byte flips, cuts and
// inserted bytes. Every case ends in a stored import or a clear error with nothing stored, in
// bounded time; a record length that runs past the end of the file names its byte offset.
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase } from '../../src/node/store/database';
import { importAnyFile } from '../../src/node/importAny';
import { inventedWafer, writeStdfLot } from '../support/stdfLot';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const valid = writeStdfLot('FZ1', [{ id: 'W1', dies: inventedWafer(3, 5) }, { id: 'W2', dies: inventedWafer(4, 5) }], true);
let counter = 0;

async function outcome(bytes: Uint8Array): Promise<'stored' | 'refused'> {
  const path = join(dir, `case-${counter++}.stdf`);
  writeFileSync(path, bytes);
  const db = openDatabase(':memory:');
  const started = performance.now();
  try {
    const result = await importAnyFile(db, path);
    expect(result.status).toBe('imported');
    return 'stored';
  } catch (error) {
    expect((error as Error).message.length).toBeGreaterThan(10);
    expect(error).not.toBeInstanceOf(TypeError);
    expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(0);
    expect((db.prepare('SELECT count(*) AS n FROM wafers').get() as { n: number }).n).toBe(0);
    return 'refused';
  } finally {
    expect(performance.now() - started).toBeLessThan(5000);
    db.close();
  }
}

describe('fuzzing the STDF importer', () => {
  it('imports the undamaged lot', async () => {
    expect(await outcome(valid)).toBe('stored');
  });
  it('damaged files end in a stored import or a clear error with nothing stored', async () => {
    const tally = { stored: 0, refused: 0 };
    await fc.assert(fc.asyncProperty(
      fc.array(fc.oneof(
        fc.record({ kind: fc.constant('flip'), at: fc.nat(valid.length - 1), byte: fc.integer({ min: 0, max: 255 }) }),
        fc.record({ kind: fc.constant('cut'), at: fc.nat(valid.length) }),
        fc.record({ kind: fc.constant('insert'), at: fc.nat(valid.length), bytes: fc.uint8Array({ minLength: 1, maxLength: 8 }) }),
      ), { minLength: 1, maxLength: 4 }),
      async (steps) => {
        let bytes = valid.slice();
        for (const s of steps) {
          const at = Math.min(s.at, bytes.length);
          if (s.kind === 'flip' && at < bytes.length) bytes[at] = (s as { byte: number }).byte;
          else if (s.kind === 'cut') bytes = bytes.slice(0, at);
          else if (s.kind === 'insert') { const ins = (s as { bytes: Uint8Array }).bytes; const out = new Uint8Array(bytes.length + ins.length); out.set(bytes.subarray(0, at)); out.set(ins, at); out.set(bytes.subarray(at), at + ins.length); bytes = out; }
        }
        tally[await outcome(bytes)]++;
      }), { numRuns: 300, seed: 424242 });
    console.log(`STDF fuzz: ${tally.stored} stored, ${tally.refused} refused with a clear error`);
    expect(tally.stored + tally.refused).toBe(300);
  });
  it('a record whose length runs past the end of the file is refused with its byte offset', async () => {
    // Append a PTR header (REC_LEN 500, REC_TYP 15, REC_SUB 10, little-endian) with 3 bytes after it.
    const tail = new Uint8Array([0xf4, 0x01, 15, 10, 1, 2, 3]);
    const bytes = new Uint8Array(valid.length + tail.length);
    bytes.set(valid);
    bytes.set(tail, valid.length);
    const path = join(dir, 'overrun.stdf');
    writeFileSync(path, bytes);
    const db = openDatabase(':memory:');
    await expect(importAnyFile(db, path)).rejects.toThrow(new RegExp(`byte ${valid.length}|offset ${valid.length}|${valid.length}`));
    expect((db.prepare('SELECT count(*) AS n FROM wafers').get() as { n: number }).n).toBe(0);
    db.close();
  });
});
