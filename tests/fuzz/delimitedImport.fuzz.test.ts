// Property-based fuzzing (fast-check) of the delimited importer and of the API argument checks:
// random and mutated inputs never crash, never hang, and always end in either a stored import or
// a clear error with nothing stored.
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase } from '../../src/node/store/database';
import { importDelimitedFile } from '../../src/node/importDelimited';
import { validateArgs } from '../../src/shared/validate';
import { decodePayload, encodePayload } from '../../src/shared/codec';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const VALID = [
  'Lot,Wafer,X,Y,Site,Ioff_n [pA],Ion_n (uA),IOFF_P (pA)',
  'F1,01,0,0,1,25.1,731,-16',
  'F1,01,1,0,2,24.8,729,-16.2',
  'F1,01,0,1,3,26.0,735,-15.9',
  'F1,02,0,0,1,23.9,728,-16.5',
].join('\n');

/** Mutations a damaged or odd export might show. */
const mutation = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: fc.nat(), byte: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ kind: fc.constant('cut' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.constantFrom('"', ',', ';', '\t', '\r\n', '\n', '\u0000', 'NaN', '1e308', '-0', '""', '#', '\uFEFF', 'Lot,Wafer,X,Y', '999999999999') }),
);

function mutate(base: Uint8Array, steps: { kind: string; at: number; byte?: number; text?: string }[]): Uint8Array {
  let bytes = base;
  for (const s of steps) {
    const at = bytes.length ? s.at % (bytes.length + 1) : 0;
    if (s.kind === 'flip' && bytes.length) { bytes = bytes.slice(); bytes[at % bytes.length] = s.byte!; }
    else if (s.kind === 'cut') bytes = bytes.slice(0, at);
    else if (s.kind === 'insert') { const t = new TextEncoder().encode(s.text!); const out = new Uint8Array(bytes.length + t.length); out.set(bytes.subarray(0, at)); out.set(t, at); out.set(bytes.subarray(at), at + t.length); bytes = out; }
  }
  return bytes;
}

let counter = 0;
async function importOutcome(bytes: Uint8Array): Promise<'stored' | 'refused'> {
  const path = join(dir, `case-${counter++}.csv`);
  writeFileSync(path, bytes);
  const db = openDatabase(':memory:');
  try {
    const started = performance.now();
    try {
      const result = await importDelimitedFile(db, path);
      expect(result.status).toBe('imported');
      const stored = db.prepare('SELECT coalesce(sum(die_count), 0) AS n FROM wafers').get() as { n: number };
      expect(stored.n).toBeGreaterThan(0);
      expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(1);
      return 'stored';
    } catch (error) {
      const message = (error as Error).message;
      expect(typeof message).toBe('string');
      expect(message.length).toBeGreaterThan(10);
      expect(error).not.toBeInstanceOf(TypeError);
      expect(error).not.toBeInstanceOf(RangeError);
      expect((db.prepare('SELECT count(*) AS n FROM imports').get() as { n: number }).n).toBe(0);
      expect((db.prepare('SELECT count(*) AS n FROM wafers').get() as { n: number }).n).toBe(0);
      return 'refused';
    } finally {
      expect(performance.now() - started).toBeLessThan(5000);
    }
  } finally {
    db.close();
  }
}

export const fuzzCounts = { stored: 0, refused: 0 };

describe('fuzzing the delimited importer', () => {
  it('mutated files end in a stored import or a clear error with nothing stored', async () => {
    const base = new TextEncoder().encode(VALID);
    await fc.assert(fc.asyncProperty(fc.array(mutation, { minLength: 1, maxLength: 6 }), async (steps) => {
      fuzzCounts[await importOutcome(mutate(base, steps))]++;
    }), { numRuns: 250, seed: 20261201 });
    console.log(`delimited fuzz (mutations): ${fuzzCounts.stored} stored, ${fuzzCounts.refused} refused with a clear error`);
    expect(fuzzCounts.stored + fuzzCounts.refused).toBe(250);
  });
  it('random bytes and random text never crash or hang the importer', async () => {
    let cases = 0;
    await fc.assert(fc.asyncProperty(fc.oneof(fc.uint8Array({ maxLength: 2048 }), fc.string({ maxLength: 2048 }).map((s) => new TextEncoder().encode(s))), async (bytes) => {
      await importOutcome(bytes);
      cases++;
    }), { numRuns: 250, seed: 7 });
    expect(cases).toBe(250);
  });
});

describe('fuzzing the API argument checks and the payload codec', () => {
  it('validateArgs either accepts or throws an ArgumentError, never anything else', () => {
    fc.assert(fc.property(fc.string({ maxLength: 20 }), fc.anything(), (method, args) => {
      try { validateArgs(method, args); } catch (error) { expect((error as Error).name).toBe('ArgumentError'); }
    }), { numRuns: 2000, seed: 11 });
  });
  it('decodePayload refuses damaged payloads with an Error, never a crash of another kind', () => {
    const good = encodePayload({ x: new Int32Array([1, 2, 3]), v: new Float64Array([1.5, NaN]), s: 'text' });
    fc.assert(fc.property(fc.nat(good.length - 1), fc.integer({ min: 0, max: 255 }), fc.nat(good.length), (at, byte, cut) => {
      const damaged = good.slice(0, Math.max(8, cut));
      if (at < damaged.length) damaged[at] = byte;
      try { decodePayload(damaged); } catch (error) { expect(error).toBeInstanceOf(Error); }
    }), { numRuns: 2000, seed: 5 });
  });
});
