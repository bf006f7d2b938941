// Writing export files: never over an existing file unless the user said so, and never a
// half-written file under the final name (written beside it, then linked or renamed into place,
// so a crash leaves either no file or the whole file).
import { linkSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

export class FileExistsError extends Error {
  override name = 'FileExistsError';
}

export function writeNewFile(path: string, data: string | Uint8Array, overwrite = false): void {
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
