// Writing export files: never over an existing file unless the user said so.
import { writeFileSync } from 'node:fs';

export class FileExistsError extends Error {
  override name = 'FileExistsError';
}

export function writeNewFile(path: string, data: string | Uint8Array, overwrite = false): void {
  try {
    writeFileSync(path, data, { flag: overwrite ? 'w' : 'wx' });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') {
      throw new FileExistsError(`${path} already exists; choose another name or allow overwriting (--force).`);
    }
    throw error;
  }
}
