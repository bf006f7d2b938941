// Process entry of the local browser mode for tools and tests (bundled to dist/node/server.mjs):
//   node dist/node/server.mjs --db PATH [--import FILE]... [--demo] [--port N]
// Prints "Offstate browser mode: URL" once it listens.
import { parseArgs } from 'node:util';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { OffstateService } from './service';
import { startServer } from './server';
import { defaultDatabasePath, demoLotPath, recentDatabasesFile, uiDir } from './paths';

async function run(): Promise<void> {
  const { values } = parseArgs({
    options: { db: { type: 'string' }, import: { type: 'string', multiple: true }, demo: { type: 'boolean' }, port: { type: 'string' } },
  });
  const dbPath = resolve(values.db ?? defaultDatabasePath());
  mkdirSync(dirname(dbPath), { recursive: true });
  const service = new OffstateService({ dbPath, mode: 'browser', workerUrl: new URL('./worker.mjs', import.meta.url), recentFile: process.env.OFFSTATE_RECENT_FILE ?? recentDatabasesFile(), warmAnalysis: true });
  const files = [...(values.demo ? [demoLotPath()] : []), ...(values.import ?? [])];
  for (const file of files) {
    const result = await service.importFile(file);
    process.stdout.write(`${file}: ${result.status === 'imported' ? `imported ${result.rows} rows` : 'already imported'}\n`);
  }
  const running = await startServer({ service, uiDir: uiDir(), port: Number(values.port ?? 0) });
  process.stdout.write(`Offstate browser mode: ${running.url}\n`);
  const stop = () => { void running.close().then(() => { service.close(); process.exit(0); }); };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

run().catch((error: Error) => { process.stderr.write(`offstate server: ${error.message}\n`); process.exit(1); });
