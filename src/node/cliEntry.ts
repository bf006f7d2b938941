// Process entry of the command line (bundled to dist/node/cli.mjs).
import { main } from './cli';

// A closed pipe (`offstate analyze | head`) ends the output quietly.
process.stdout.on('error', (error: NodeJS.ErrnoException) => { if (error.code === 'EPIPE') process.exit(0); throw error; });

main(process.argv.slice(2)).then(
  (code) => { if (code !== undefined) process.exitCode = code; },
  (error: Error) => { process.stderr.write(`offstate: ${error.message}\n`); process.exitCode = 1; },
);
