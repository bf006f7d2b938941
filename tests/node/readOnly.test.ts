// A database file the user may not write (received from a colleague, on a read-only share) is
// opened for reading: its lots can be analysed, imports are refused with a sentence, and the file
// is never changed. Run as an unprivileged user (setpriv), since root may write anything.
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_CSV, ROOT, scratchDir } from '../support/paths';

const CLI = join(ROOT, 'dist', 'node', 'cli.mjs');
const canDropPrivileges = process.getuid?.() === 0 && existsSync('/usr/bin/setpriv') && existsSync(CLI);
const dir = scratchDir();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function asNobody(args: string[]) {
  return spawnSync('/usr/bin/setpriv', ['--reuid=65534', '--regid=65534', '--clear-groups', process.execPath, CLI, ...args], { encoding: 'utf8', cwd: dir, env: { ...process.env, HOME: dir }, maxBuffer: 256 << 20 });
}

if (!canDropPrivileges) console.log('read-only database test skipped: needs root, setpriv and a built CLI (npm test builds it).');

describe.skipIf(!canDropPrivileges)('a database the user may not write', () => {
  it('is analysed read-only, refuses imports with a sentence, and stays byte-identical', () => {
    chmodSync(dir, 0o777);
    const db = join(dir, 'colleague.sqlite');
    expect(spawnSync(process.execPath, [CLI, 'import', DEMO_CSV, '--db', db]).status).toBe(0);
    chmodSync(db, 0o444);
    const before = readFileSync(db);
    const analysed = asNobody(['analyze', db, '--json']);
    expect(analysed.stderr).toBe('');
    expect(JSON.parse(analysed.stdout).wafers.length).toBe(25);
    const refused = asNobody(['import', join(ROOT, 'tests', 'fixtures', 'tiny.csv'), '--db', db]);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/read-only for you.*nothing was imported/);
    expect(readFileSync(db).equals(before)).toBe(true);
  });
});
