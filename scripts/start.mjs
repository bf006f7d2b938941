// `npm start`: opens Offstate with the demo lot imported. Uses the Electron desktop shell where
// its binary is installed; otherwise says so in one line and serves the same UI in the local
// browser mode on 127.0.0.1 (printed URL carries a random token).
import { existsSync, mkdirSync, cpSync } from 'node:fs';
import { spawn, spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const require = createRequire(import.meta.url);
const passThrough = process.argv.slice(2);

if (!existsSync(join(root, 'dist', 'node', 'cli.mjs')) || !existsSync(join(root, 'dist', 'ui', 'index.html'))) {
  const built = spawnSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
  if (built.status !== 0) process.exit(built.status ?? 1);
}

function electronBinary() {
  try {
    const path = require('electron');
    return typeof path === 'string' && existsSync(path) ? path : undefined;
  } catch {
    return undefined;
  }
}

/** better-sqlite3 built for Electron's ABI, kept apart from the Node build the CLI and tests use. */
function electronSqliteBinding() {
  const version = require('electron/package.json').version;
  const dir = join(root, '.cache', `electron-${version}`, 'better-sqlite3');
  const binding = join(dir, 'build', 'Release', 'better_sqlite3.node');
  if (existsSync(binding)) return binding;
  mkdirSync(dirname(dir), { recursive: true });
  cpSync(join(root, 'node_modules', 'better-sqlite3'), dir, { recursive: true, filter: (p) => !p.includes(`${join('better-sqlite3', 'build')}`) });
  const gyp = join(dirname(process.execPath), '..', 'lib', 'node_modules', 'npm', 'node_modules', 'node-gyp', 'bin', 'node-gyp.js');
  const args = [existsSync(gyp) ? gyp : require.resolve('node-gyp/bin/node-gyp.js'), 'rebuild', `--target=${version}`, '--runtime=electron', '--dist-url=https://electronjs.org/headers'];
  process.stdout.write(`Building better-sqlite3 for Electron ${version} (once)...\n`);
  const result = spawnSync(process.execPath, args, { cwd: dir, stdio: 'inherit' });
  return result.status === 0 && existsSync(binding) ? binding : undefined;
}

function browserMode(reason) {
  process.stdout.write(`${reason}; starting the local browser mode instead.\n`);
  const child = spawn(process.execPath, [join(root, 'dist', 'node', 'cli.mjs'), 'serve', '--demo', ...passThrough], { cwd: root, stdio: 'inherit' });
  child.on('exit', (code) => process.exit(code ?? 0));
  for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => child.kill(signal));
}

const electron = electronBinary();
if (!electron) {
  browserMode('No Electron binary is installed on this machine');
} else {
  const binding = electronSqliteBinding();
  if (!binding) {
    browserMode('better-sqlite3 could not be built for Electron here');
  } else {
    const child = spawn(electron, [join(root, 'dist', 'electron', 'main.mjs'), '--demo', ...passThrough], {
      cwd: root, stdio: 'inherit', env: { ...process.env, OFFSTATE_SQLITE_BINDING: binding },
    });
    child.on('exit', (code) => process.exit(code ?? 0));
  }
}
