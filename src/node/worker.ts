// Worker-thread entry. One script, started in three ways (its workerData says which):
// - a one-off job (JobRequest: an import) that opens its own connection to the database, posts
//   progress and the result, and ends;
// - the analysis service (ANALYSIS_SERVICE_TASK): kept by the app between analyses so its code
//   stays compiled, it takes AnalysisRequests one at a time (analysisWorker.ts);
// - an analysis helper (HELPER_TASK): analyses parameter groups for one of those
//   (parallelAnalysis.ts); it gets the columns in the request and never opens the database.

import { parentPort, workerData } from 'node:worker_threads';
import type { JobMessage, JobRequest } from './jobs';
import { openDatabase } from './store/database';
import { importAnyFile } from './importAny';
import { HELPER_TASK, HelperPool, serveGroupRequests } from './parallelAnalysis';
import { ANALYSIS_SERVICE_TASK, serveAnalysisRequests } from './analysisWorker';

const port = parentPort!;
const data = workerData as JobRequest | { task: typeof HELPER_TASK } | { task: typeof ANALYSIS_SERVICE_TASK };
const scriptUrl = new URL(import.meta.url);

async function runJob(job: JobRequest): Promise<void> {
  const controller = new AbortController();
  port.on('message', (m: { type: string }) => { if (m.type === 'cancel') controller.abort(); });
  const post = (m: JobMessage) => port.postMessage(m);
  const db = openDatabase(job.dbPath, { nativeBinding: job.nativeBinding });
  try {
    const result = await importAnyFile(db, job.path, {
      fileName: job.fileName,
      signal: controller.signal,
      mapping: job.mapping,
      mappingName: job.mappingName,
      onProgress: (p) => post({ type: 'progress', done: p.bytesDone, total: p.bytesTotal, rows: p.rows }),
    });
    post({ type: 'result', result });
  } finally {
    db.close();
  }
}

if (data.task === HELPER_TASK) serveGroupRequests(port);
else if (data.task === ANALYSIS_SERVICE_TASK) serveAnalysisRequests(port, new HelperPool(scriptUrl));
else runJob(data).catch((error: Error) => port.postMessage({ type: 'error', name: error.name, message: error.message } satisfies JobMessage));
