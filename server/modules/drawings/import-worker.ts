import { parentPort } from 'node:worker_threads';
import type { ImportJob, ImportReply } from './import-pool';
import { readDrawingJob } from './import-read';

const port = parentPort;
if (!port) throw new Error('import-worker.ts runs only as a worker thread (see import-pool.ts).');
port.on('message', (job: ImportJob) => {
  port.postMessage({ jobId: job.jobId, type: 'started' } satisfies ImportReply);
  port.postMessage(readDrawingJob(job));
});
