// Process entry of the command line (bundled to dist/node/cli.mjs).
import { main } from './cli';

main(process.argv.slice(2)).then(
  (code) => { if (code !== undefined) process.exitCode = code; },
  (error: Error) => { process.stderr.write(`offstate: ${error.message}\n`); process.exitCode = 1; },
);
