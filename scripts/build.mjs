// Builds every runnable piece: the Node command line and worker, the Electron shell, and the
// renderer (Vite). Runs on `npm install` (prepare), before `npm test`, and from `npm start`.
import { build } from 'esbuild';
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const quiet = process.argv.includes('--quiet');
const started = performance.now();

const common = { bundle: true, platform: 'node', target: 'node20', sourcemap: true, packages: 'external', logLevel: 'warning', absWorkingDir: root };
await Promise.all([
  build({ ...common, format: 'esm', entryPoints: { cli: 'src/node/cliEntry.ts', worker: 'src/node/worker.ts', server: 'src/node/serverEntry.ts' }, outdir: 'dist/node', outExtension: { '.js': '.mjs' } }),
  build({ ...common, format: 'esm', entryPoints: { main: 'electron/main.ts' }, outdir: 'dist/electron', outExtension: { '.js': '.mjs' }, external: ['electron'] }),
  // A sandboxed preload may require only Electron's renderer modules: bundle it as CommonJS.
  build({ ...common, format: 'cjs', packages: undefined, entryPoints: { preload: 'electron/preload.ts' }, outdir: 'dist/electron', outExtension: { '.js': '.cjs' }, external: ['electron'] }),
].filter(Boolean));

if (existsSync(join(root, 'vite.config.ts')) && existsSync(join(root, 'src/ui/index.html'))) {
  const vite = spawnSync(process.execPath, [join(root, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', quiet ? 'error' : 'warn'], { cwd: root, stdio: 'inherit' });
  if (vite.status !== 0) process.exit(vite.status ?? 1);
}
if (!quiet) console.log(`offstate build: done in ${((performance.now() - started) / 1000).toFixed(1)} s`);
