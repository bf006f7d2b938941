// Worker-thread entry for long jobs: opens its own connection to the database and runs one
// import or one analysis, posting progress and the result back to the parent. An analysis uses
// this same script for its helper threads (parallelAnalysis.ts): those get their columns in the
// request and never open the database.

import { parentPort, workerData } from 'node:worker_threads';
import type { JobMessage, JobRequest } from './jobs';
import { openDatabase } from './store/database';
import { importAnyFile } from './importAny';
import { analyzeStoredLotInParallel } from './analysisStore';
import { answerGroupRequest, type GroupMessage, type GroupRequest } from './parallelAnalysis';

const request = workerData as JobRequest | GroupRequest;
const controller = new AbortController();
const post = (m: JobMessage | GroupMessage) => parentPort!.postMessage(m);

async function main(job: JobRequest): Promise<void> {
  const db = openDatabase(job.dbPath, { nativeBinding: job.nativeBinding });
  try {
    if (job.task === 'import') {
      const result = await importAnyFile(db, job.path, {
        fileName: job.fileName,
        signal: controller.signal,
        mapping: job.mapping,
        mappingName: job.mappingName,
        onProgress: (p) => post({ type: 'progress', done: p.bytesDone, total: p.bytesTotal, rows: p.rows }),
      });
      post({ type: 'result', result });
    } else {
      const result = await analyzeStoredLotInParallel(db, job.lot, {
        workerUrl: new URL(import.meta.url),
        onProgress: (done, total) => post({ type: 'progress', done, total }),
      });
      post({ type: 'result', result });
    }
  } finally {
    db.close();
  }
}

if (request.task === 'analyze-group') {
  // Posts its result and ends; the parent stops it outright if the analysis is cancelled.
  answerGroupRequest(request, post);
} else {
  parentPort!.on('message', (m: { type: string }) => { if (m.type === 'cancel') controller.abort(); });
  main(request).catch((error: Error) => post({ type: 'error', name: error.name, message: error.message }));
}
