// Opens an Offstate database: WAL, foreign keys, a busy timeout for a second reader, the
// application id that tells our files from foreign ones, and the pending migrations.

import Database from 'better-sqlite3';
import { accessSync, constants, existsSync, statSync } from 'node:fs';
import { MIGRATIONS, SCHEMA_VERSION } from './migrations';

/** "OFST" as a 32-bit integer, written into the SQLite header's application_id field. */
export const APPLICATION_ID = 0x4f465354;

export class StoreError extends Error {
  override name = 'StoreError';
}

export interface OpenOptions {
  readonly?: boolean;
  /** Path of a better-sqlite3 native binding built for another runtime (Electron). */
  nativeBinding?: string;
}

export type Db = Database.Database;

/** True when this process may write the file (a read-only file is opened read-only, not refused). */
export function canWrite(path: string): boolean {
  try {
    accessSync(path, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

export function openDatabase(path: string, options: OpenOptions = {}): Db {
  const exists = path !== ':memory:' && existsSync(path);
  if (exists && statSync(path).size > 0) {
    // Check the header before SQLite touches the file, so a foreign file is never written to.
    const probe = new Database(path, { readonly: true, fileMustExist: true, nativeBinding: options.nativeBinding });
    try {
      const appId = probe.pragma('application_id', { simple: true }) as number;
      const version = probe.pragma('user_version', { simple: true }) as number;
      const tables = probe.prepare("SELECT count(*) AS n FROM sqlite_master").get() as { n: number };
      const blank = appId === 0 && version === 0 && tables.n === 0;
      if (appId !== APPLICATION_ID && !blank) {
        throw new StoreError(`${path} is not an Offstate database (it is another SQLite file); it was left untouched.`);
      }
      if (version > SCHEMA_VERSION) {
        throw new StoreError(`${path} was written by a newer Offstate (schema ${version}, this one knows ${SCHEMA_VERSION}); update Offstate to open it.`);
      }
    } catch (error) {
      if (error instanceof StoreError) throw error;
      throw new StoreError(`${path} is not a readable SQLite database (${(error as Error).message}); it was left untouched.`);
    } finally {
      probe.close();
    }
  }
  const readonly = options.readonly ?? (exists && !canWrite(path));
  const db = new Database(path, { readonly, nativeBinding: options.nativeBinding });
  db.pragma('busy_timeout = 5000');
  if (!readonly) {
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = NORMAL');
  }
  db.pragma('foreign_keys = ON');
  if (!readonly) migrate(db);
  return db;
}

export function migrate(db: Db): void {
  const current = db.pragma('user_version', { simple: true }) as number;
  const pending = MIGRATIONS.filter((m) => m.version > current);
  if (pending.length === 0) return;
  db.transaction(() => {
    for (const step of pending) db.exec(step.sql);
    db.pragma(`application_id = ${APPLICATION_ID}`);
    db.pragma(`user_version = ${SCHEMA_VERSION}`);
  })();
}
