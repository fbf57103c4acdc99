import { parentPort } from 'node:worker_threads';
import { judgePassword } from './password-rule';
import type { JudgeJob, JudgeReply } from './password-judge';

// Loads zxcvbn's dictionaries before taking the first password: the pool's time limit runs from
// 'started', so the loading is not charged to that password (jobs posted meanwhile wait in the
// message queue until the handler below is set).
judgePassword('warming up the dictionaries', []);

parentPort!.on('message', (job: JudgeJob) => {
  parentPort!.postMessage({ type: 'started', jobId: job.jobId } satisfies JudgeReply);
  parentPort!.postMessage({ type: 'verdict', jobId: job.jobId, verdict: judgePassword(job.password, job.personal) } satisfies JudgeReply);
});
