// Worker-thread entry for long jobs: opens its own connection to the database and runs one
// import or one analysis, posting progress and the result back to the parent.

import { parentPort, workerData } from 'node:worker_threads';
import type { JobMessage, JobRequest } from './jobs';
import { openDatabase } from './store/database';
import { importAnyFile } from './importAny';
import { analyzeStoredLot } from './analysisStore';

const request = workerData as JobRequest;
const controller = new AbortController();
parentPort!.on('message', (m: { type: string }) => { if (m.type === 'cancel') controller.abort(); });
const post = (m: JobMessage) => parentPort!.postMessage(m);

async function main(): Promise<void> {
  const db = openDatabase(request.dbPath, { nativeBinding: request.nativeBinding });
  try {
    if (request.task === 'import') {
      const result = await importAnyFile(db, request.path, {
        fileName: request.fileName,
        signal: controller.signal,
        mapping: request.mapping,
        mappingName: request.mappingName,
        onProgress: (p) => post({ type: 'progress', done: p.bytesDone, total: p.bytesTotal, rows: p.rows }),
      });
      post({ type: 'result', result });
    } else {
      const result = analyzeStoredLot(db, request.lot, (done, total) => post({ type: 'progress', done, total }));
      post({ type: 'result', result });
    }
  } finally {
    db.close();
  }
}

main().catch((error: Error) => post({ type: 'error', name: error.name, message: error.message }));
