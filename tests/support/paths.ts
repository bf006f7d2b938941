// Paths tests share: the project root, the reference data folder beside it, scratch space.
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const REFERENCE_DIR = resolve(ROOT, '..', 'shared', 'reference');
export const HAS_REFERENCE = existsSync(REFERENCE_DIR);
export const DEMO_CSV = join(ROOT, 'sample-data', 'demo-lot.csv');

export function scratchDir(prefix = 'offstate-test-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}
