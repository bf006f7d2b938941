// Where Offstate keeps its files by default, and where the built pieces sit.

import { homedir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** The user's default database: $OFFSTATE_DB, else $XDG_DATA_HOME/offstate, else ~/.local/share/offstate. */
export function defaultDatabasePath(): string {
  if (process.env.OFFSTATE_DB) return resolve(process.env.OFFSTATE_DB);
  const base = process.env.XDG_DATA_HOME || join(homedir(), '.local', 'share');
  return join(base, 'offstate', 'offstate.sqlite');
}

/** The project root: the nearest folder above this file holding package.json. */
export function projectRoot(from = dirname(fileURLToPath(import.meta.url))): string {
  let dir = from;
  for (;;) {
    if (existsSync(join(dir, 'package.json'))) return dir;
    const up = dirname(dir);
    if (up === dir) return process.cwd();
    dir = up;
  }
}

export function demoLotPath(): string {
  return join(projectRoot(), 'sample-data', 'demo-lot.csv');
}

export function uiDir(): string {
  return join(projectRoot(), 'dist', 'ui');
}

/** Where the list of recently opened databases is kept (beside the default database). */
export function recentDatabasesFile(): string {
  return join(dirname(defaultDatabasePath()), 'recent-databases.json');
}
