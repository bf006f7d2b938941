// Scratch folders for one test file, removed after each test, and files written into them.
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach } from 'vitest';
import { scratchDir } from './paths';

export function scratchSpace(): { tmp: () => string; write: (name: string, data: string | Uint8Array) => string } {
  const dirs: string[] = [];
  afterEach(() => { for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true }); });
  const tmp = () => { const d = scratchDir(); dirs.push(d); return d; };
  const write = (name: string, data: string | Uint8Array) => {
    const path = join(tmp(), name);
    writeFileSync(path, data);
    return path;
  };
  return { tmp, write };
}
