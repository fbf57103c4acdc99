import { threadPoolCreate, type ThreadPool } from '../../workers/thread-pool';
import { AppError } from '../../errors/app-error';
import type { PasswordVerdict } from './password-rule';

/**
 * zxcvbn takes from a few milliseconds to a few seconds per password: a short pattern repeated
 * to 30–100 characters ("ab1!ab1!…") cost 0.7–2.2 s each in our measurement (2 shared cores,
 * load ~12). Anyone may send a password to the reset and invitation routes, so the check runs
 * in one worker thread, one password at a time, with a time limit: the server's main thread
 * keeps answering everyone else.
 */
export interface JudgeJob {
  jobId: number;
  password: string;
  personal: string[];
}

export type JudgeReply = { jobId: number; type: 'started' } | { jobId: number; type: 'verdict'; verdict: PasswordVerdict };

const WORKER_ENTRY = new URL('./password-judge-entry.mjs', import.meta.url);
/** Longest one password may take to judge; past it the password is refused (the cautious reading). */
export const JUDGE_TIME_LIMIT_MS = 4000;
/** Passwords waiting beyond this many are turned away at once with "try again". */
const MAX_WAITING = 32;

export const TOO_SLOW_REFUSAL =
  'That password takes too long to check because it repeats a short pattern many times: use a phrase of four or more unrelated words instead.';

const stoppedError = () => new Error('The password check stopped unexpectedly.');

/** One worker, one password at a time; made on first use. */
let pool: ThreadPool<Omit<JudgeJob, 'jobId'>, JudgeReply> | null = null;

/** zxcvbn's verdict on a password, judged off the main thread within {@link JUDGE_TIME_LIMIT_MS}. */
export function judgePasswordOffThread(password: string, personal: string[], timeLimitMs = JUDGE_TIME_LIMIT_MS): Promise<PasswordVerdict> {
  pool ??= threadPoolCreate({
    entry: WORKER_ENTRY,
    maxWaiting: MAX_WAITING,
    closedError: stoppedError,
    busyError: () => new AppError('password-check-busy', 'Many passwords are being checked right now: wait a minute and try again.', 503),
  });
  return pool.run({ password, personal }, { timeLimitMs }).then((outcome) => {
    if (outcome.type === 'timed-out') return { score: 0, refusal: TOO_SLOW_REFUSAL };
    if (outcome.type !== 'done' || outcome.reply.type !== 'verdict') throw stoppedError();
    return outcome.reply.verdict;
  });
}

/** Throws a 400 naming the field when the password fails the rule; writes nothing. */
export async function assertPasswordAllowed(password: string, personal: string[], field = 'password'): Promise<void> {
  const { refusal } = await judgePasswordOffThread(password, personal);
  if (refusal) throw new AppError('weak-password', refusal, 400, { [field]: refusal });
}
