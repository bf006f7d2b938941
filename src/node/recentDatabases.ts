// The databases a user opened, most recent first, kept in a small JSON file so the desktop and
// the browser mode can offer them again. A damaged list is started afresh, never an error.
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';

const MAX_RECENT = 10;

export function readRecentDatabases(file: string): string[] {
  try {
    const list = JSON.parse(readFileSync(file, 'utf8')) as unknown;
    return Array.isArray(list) ? list.filter((p): p is string => typeof p === 'string').slice(0, MAX_RECENT) : [];
  } catch {
    return [];
  }
}

export function rememberDatabase(file: string, path: string): string[] {
  const list = [path, ...readRecentDatabases(file).filter((p) => p !== path && existsSync(p))].slice(0, MAX_RECENT);
  try {
    mkdirSync(dirname(file), { recursive: true });
    const temporary = `${file}.${process.pid}.partial`;
    writeFileSync(temporary, JSON.stringify(list, null, 1));
    renameSync(temporary, file);
  } catch {
    // A read-only home folder only costs the list, not the work.
  }
  return list;
}
