#!/usr/bin/env node
// The `offstate` command. Runs the bundled CLI; builds it first if this checkout has not been
// built yet (for example after `npm install --ignore-scripts`).
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const cli = join(root, 'dist', 'node', 'cli.mjs');
if (!existsSync(cli)) {
  const built = spawnSync(process.execPath, [join(root, 'scripts', 'build.mjs'), '--quiet'], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] });
  if (built.status !== 0) {
    process.stderr.write('offstate: the build failed; run `npm run build` to see why.\n');
    process.exit(1);
  }
}
await import(pathToFileURL(cli).href);
