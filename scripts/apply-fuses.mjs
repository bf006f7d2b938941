// Writes Offstate's fuse decisions (electron/policy.ts, ELECTRON_FUSES) into a packaged Electron
// binary: node scripts/apply-fuses.mjs PATH_TO_BINARY
import { build } from 'esbuild';
import { flipFuses, FuseV1Options, FuseVersion } from '@electron/fuses';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const binary = process.argv[2];
if (!binary) { console.error('usage: node scripts/apply-fuses.mjs PATH_TO_ELECTRON_BINARY'); process.exit(2); }
const out = join(root, '.cache', 'policy.mjs');
await build({ entryPoints: [join(root, 'electron', 'policy.ts')], bundle: true, format: 'esm', platform: 'node', outfile: out, external: ['electron'], logLevel: 'warning' });
const { ELECTRON_FUSES } = await import(pathToFileURL(out).href);
const config = { version: FuseVersion.V1, strictlyRequireAllFuses: true };
for (const [name, value] of Object.entries(ELECTRON_FUSES)) config[FuseV1Options[name]] = value;
await flipFuses(binary, config);
console.log(`Fuses written into ${binary}: ${Object.entries(ELECTRON_FUSES).map(([k, v]) => `${k}=${v}`).join(', ')}`);
