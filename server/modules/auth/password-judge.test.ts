import { describe, expect, it } from 'vitest';
import { AppError } from '../../errors/app-error';
import { assertPasswordAllowed, judgePasswordOffThread, TOO_SLOW_REFUSAL } from './password-judge';
import { judgePassword } from './password-rule';

// The rule run in its worker thread: same verdicts as on the main thread, a time limit, and a
// fresh worker after a password that ran past it.

describe('judging passwords off the main thread', () => {
  it('when a password is judged in the worker, then the verdict is the one judgePassword gives', async () => {
    for (const p of ['password1234', 'kiln mortise ladder fern 71', 'zephyrinekowalczyk']) {
      const personal = ['zephyrine.kowalczyk@example.com'];
      expect(await judgePasswordOffThread(p, personal)).toEqual(judgePassword(p, personal));
    }
  }, 60_000);

  it('when assertPasswordAllowed refuses, then it throws a 400 naming the given field; a strong password passes', async () => {
    const err = await assertPasswordAllowed('password1234', [], 'newPassword').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).status).toBe(400);
    expect((err as AppError).fields?.newPassword).toBe((err as AppError).message);
    await expect(assertPasswordAllowed('kiln mortise ladder fern 71', [])).resolves.toBeUndefined();
  }, 60_000);

  it('when a password runs past the time limit, then it is refused with a sentence and the next password is judged by a fresh worker', async () => {
    // A short pattern repeated: zxcvbn's slowest kind of input (seconds); a 1 ms limit is surely passed.
    const slow = 'ab1!'.repeat(25);
    const verdict = await judgePasswordOffThread(slow, [], 1);
    expect(verdict).toEqual({ score: 0, refusal: TOO_SLOW_REFUSAL });
    // The worker that ran past the limit was ended; the next one answers normally.
    expect(await judgePasswordOffThread('kiln mortise ladder fern 71', [])).toEqual(judgePassword('kiln mortise ladder fern 71', []));
  }, 60_000);
});
