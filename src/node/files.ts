// Writing export files: never over an existing file unless the user said so, and never a
// half-written file under the final name (written beside it, then linked or renamed into place,
// so a crash leaves either no file or the whole file). The hidden temporary file a killed export
// leaves behind is removed by the next export into that folder.
import { linkSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

export class FileExistsError extends Error {
  override name = 'FileExistsError';
}

const PARTIAL = /^\..+\.(\d+)\.partial$/;

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: alive, another user's.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Removes our temporary files in `folder` whose writing process is gone (a killed export).
 * A file whose process number is in use again is left alone. */
export function removeStalePartials(folder: string): number {
  let removed = 0;
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return 0;
  }
  for (const name of names) {
    const m = PARTIAL.exec(name);
    if (!m || Number(m[1]) === process.pid || processAlive(Number(m[1]))) continue;
    rmSync(join(folder, name), { force: true });
    removed++;
  }
  return removed;
}

export function writeNewFile(path: string, data: string | Uint8Array, overwrite = false): void {
  removeStalePartials(dirname(path));
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.partial`);
  writeFileSync(temporary, data, { flag: 'w' });
  try {
    if (overwrite) {
      renameSync(temporary, path);
      return;
    }
    // link() fails when the name exists, so an existing file is never replaced.
    linkSync(temporary, path);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') {
      throw new FileExistsError(`${path} already exists; choose another name or allow overwriting (--force).`);
    }
    throw error;
  } finally {
    rmSync(temporary, { force: true });
  }
}
