import { parentPort } from 'node:worker_threads';
import { judgePassword } from './password-rule';
import type { JudgeJob, JudgeReply } from './password-judge';

// Loads zxcvbn's dictionaries before the first real password, then says so.
judgePassword('warming up the dictionaries', []);
parentPort!.postMessage({ type: 'ready' } satisfies JudgeReply);

parentPort!.on('message', (job: JudgeJob) => {
  parentPort!.postMessage({ type: 'verdict', jobId: job.jobId, verdict: judgePassword(job.password, job.personal) } satisfies JudgeReply);
});
