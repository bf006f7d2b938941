// `npm run bench`: bundles the benchmark runner with esbuild and runs it. Prints figures only;
// no benchmark is a test and none gates CI on a time.
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const outfile = join(root, '.cache', 'bench', 'run.mjs');
await build({ entryPoints: [join(root, 'scripts', 'bench', 'run.ts')], bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external', outfile, logLevel: 'warning' });
const run = spawnSync(process.execPath, ['--max-old-space-size=8192', outfile, ...process.argv.slice(2)], { cwd: root, stdio: 'inherit' });
process.exit(run.status ?? 1);
