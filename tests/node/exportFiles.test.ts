// Export files (src/node/files.ts): the hidden temporary file of an export whose process was
// killed is removed by the next export into that folder; one whose process still runs is not.
import { afterAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { FileExistsError, writeNewFile } from '../../src/node/files';
import { scratchDir } from '../support/paths';

const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('export files', () => {
  it('removes the temporary files of dead exports, keeps those of running ones, and never overwrites', async () => {
    // A process that has ended: its number is free (POSIX kill(pid, 0) fails with ESRCH).
    const ended = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
    const deadPid = Number(ended.stdout);
    const running = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 30000)'], { stdio: 'ignore' });
    try {
      const dead = join(dir, `.lot-flagged.csv.${deadPid}.partial`);
      const alive = join(dir, `.other.csv.${running.pid}.partial`);
      const unrelated = join(dir, '.notes.partial');
      for (const f of [dead, alive, unrelated]) writeFileSync(f, 'half');
      writeNewFile(join(dir, 'fa.csv'), 'die,x,y\n');
      expect(existsSync(dead)).toBe(false);
      expect(existsSync(alive)).toBe(true);
      expect(existsSync(unrelated)).toBe(true);
      expect(readFileSync(join(dir, 'fa.csv'), 'utf8')).toBe('die,x,y\n');
      expect(() => writeNewFile(join(dir, 'fa.csv'), 'other')).toThrow(FileExistsError);
      expect(readFileSync(join(dir, 'fa.csv'), 'utf8')).toBe('die,x,y\n');
      expect(readdirSync(dir).filter((n) => n.endsWith('.partial')).sort()).toEqual([`.other.csv.${running.pid}.partial`, '.notes.partial'].sort());
    } finally {
      running.kill();
    }
  });
});
