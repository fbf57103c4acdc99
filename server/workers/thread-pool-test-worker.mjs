// A worker for thread-pool.test.ts only: each job names what to do.
import { parentPort } from 'node:worker_threads';

parentPort.on('message', (job) => {
  parentPort.postMessage({ jobId: job.jobId, type: 'started' });
  if (job.do === 'echo') parentPort.postMessage({ jobId: job.jobId, type: 'echo', value: job.value, threadBytes: job.bytes?.byteLength ?? null });
  else if (job.do === 'count') {
    for (let i = 1; i <= job.value; i++) parentPort.postMessage({ jobId: job.jobId, type: 'progress', step: i });
    parentPort.postMessage({ jobId: job.jobId, type: 'echo', value: job.value });
  } else if (job.do === 'spin') for (;;);
  else if (job.do === 'exit') process.exit(3);
  else if (job.do === 'hog') {
    const keep = [];
    for (;;) keep.push(new Array(1e5).fill(keep.length));
  }
});
