import { Worker } from 'node:worker_threads';
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

export type JudgeReply = { type: 'ready' } | { type: 'verdict'; jobId: number; verdict: PasswordVerdict };

const WORKER_ENTRY = new URL('./password-judge-entry.mjs', import.meta.url);
/** Longest one password may take to judge; past it the password is refused (the cautious reading). */
export const JUDGE_TIME_LIMIT_MS = 4000;
/** Passwords waiting beyond this many are turned away at once with "try again". */
const MAX_WAITING = 32;

export const TOO_SLOW_REFUSAL =
  'That password takes too long to check because it repeats a short pattern many times: use a phrase of four or more unrelated words instead.';

interface Task {
  job: JudgeJob;
  timeLimitMs: number;
  resolve(v: PasswordVerdict): void;
  reject(e: Error): void;
}

let worker: Worker | null = null;
let ready = false;
let running: { task: Task; timer: NodeJS.Timeout } | null = null;
const waiting: Task[] = [];
let nextId = 1;

function startWorker(): void {
  const w = new Worker(WORKER_ENTRY);
  worker = w;
  ready = false;
  w.on('message', (reply: JudgeReply) => {
    if (w !== worker) return;
    if (reply.type === 'ready') {
      ready = true;
    } else if (running && running.task.job.jobId === reply.jobId) {
      clearTimeout(running.timer);
      const { task } = running;
      running = null;
      task.resolve(reply.verdict);
    }
    pump();
  });
  w.on('error', () => replaceWorker(new Error('The password check stopped unexpectedly.')));
  w.on('exit', () => {
    if (w === worker) replaceWorker(new Error('The password check stopped unexpectedly.'));
  });
}

/** Ends the current worker (hung or dead); the job it held gets `failure`; the next starts fresh. */
function replaceWorker(failure: Error | PasswordVerdict): void {
  const old = worker;
  worker = null;
  ready = false;
  if (running) {
    clearTimeout(running.timer);
    const { task } = running;
    running = null;
    if (failure instanceof Error) task.reject(failure);
    else task.resolve(failure);
  }
  void old?.terminate();
  pump();
}

function pump(): void {
  if (running || waiting.length === 0) {
    // An idle worker must not keep the process alive (tests, scripts).
    if (!running) worker?.unref();
    return;
  }
  if (!worker) startWorker();
  worker!.ref();
  if (!ready) return;
  const task = waiting.shift()!;
  const timer = setTimeout(() => replaceWorker({ score: 0, refusal: TOO_SLOW_REFUSAL }), task.timeLimitMs);
  running = { task, timer };
  worker!.postMessage(task.job);
}

/** zxcvbn's verdict on a password, judged off the main thread within {@link JUDGE_TIME_LIMIT_MS}. */
export function judgePasswordOffThread(password: string, personal: string[], timeLimitMs = JUDGE_TIME_LIMIT_MS): Promise<PasswordVerdict> {
  if (waiting.length >= MAX_WAITING) {
    return Promise.reject(new AppError('password-check-busy', 'Many passwords are being checked right now: wait a minute and try again.', 503));
  }
  return new Promise((resolve, reject) => {
    waiting.push({ job: { jobId: nextId++, password, personal }, timeLimitMs, resolve, reject });
    pump();
  });
}

/** Throws a 400 naming the field when the password fails the rule; writes nothing. */
export async function assertPasswordAllowed(password: string, personal: string[], field = 'password'): Promise<void> {
  const { refusal } = await judgePasswordOffThread(password, personal);
  if (refusal) throw new AppError('weak-password', refusal, 400, { [field]: refusal });
}
