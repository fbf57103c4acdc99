import { describe, expect, it } from 'vitest';
import { threadPoolCreate } from './thread-pool';

// Real worker threads running a tiny worker module; no mocks.
const entry = new URL('./thread-pool-test-worker.mjs', import.meta.url);
type Job = { do: 'echo' | 'count' | 'spin' | 'exit' | 'hog'; value?: number; bytes?: Uint8Array };
type Reply = { jobId: number; type: string; value?: number };

function pool(extra: { size?: number; memoryMb?: number; maxWaiting?: number } = {}) {
  return threadPoolCreate<Job, Reply>({ entry, closedError: () => new Error('closed'), busyError: () => new Error('busy'), ...extra });
}

describe('thread pool', () => {
  it('answers each job with its own reply, in a worker, and calls onStart first', async () => {
    const p = pool({ size: 2 });
    const started: number[] = [];
    const outcomes = await Promise.all([1, 2, 3].map((value) => p.run({ do: 'echo', value }, { onStart: () => started.push(value) })));
    expect(outcomes.map((o) => (o.type === 'done' ? o.reply.value : null))).toEqual([1, 2, 3]);
    expect(started.sort()).toEqual([1, 2, 3]);
    expect(p.pending()).toBe(0);
    await p.close();
  });

  it('passes progress messages to onProgress in order, and settles only on the reply after them', async () => {
    const p = pool();
    const steps: unknown[] = [];
    const outcome = await p.run({ do: 'count', value: 3 }, { onProgress: (m) => steps.push(m.step) });
    expect(steps).toEqual([1, 2, 3]);
    expect(outcome).toMatchObject({ type: 'done', reply: { type: 'echo', value: 3 } });
    await p.close();
  });

  it('moves a transferred buffer to the worker (the sender is left with an empty one)', async () => {
    const p = pool();
    const bytes = new Uint8Array(1024);
    const outcome = await p.run({ do: 'echo', value: 1, bytes }, { transfer: [bytes.buffer] });
    expect(outcome.type === 'done' && (outcome.reply as { threadBytes?: number }).threadBytes).toBe(1024);
    expect(bytes.byteLength).toBe(0);
    await p.close();
  });

  it('stops a job past its time limit and runs the next in a fresh worker', async () => {
    const p = pool();
    const slow = p.run({ do: 'spin' }, { timeLimitMs: 300 });
    const next = p.run({ do: 'echo', value: 7 });
    expect(await slow).toEqual({ type: 'timed-out', seconds: 0.3 });
    expect(await next).toMatchObject({ type: 'done', reply: { value: 7 } });
    await p.close();
  });

  it('reports a worker that exits, and one that runs out of its heap, and carries on', async () => {
    const p = pool({ memoryMb: 32 });
    expect(await p.run({ do: 'exit' })).toEqual({ type: 'stopped', why: 'worker exit code 3' });
    expect(await p.run({ do: 'hog' }, { timeLimitMs: 20_000 })).toEqual({ type: 'out-of-memory', megabytes: 32 });
    expect(await p.run({ do: 'echo', value: 5 })).toMatchObject({ type: 'done', reply: { value: 5 } });
    await p.close();
  });

  it('turns a job away when the queue is full, and rejects waiting jobs when closed', async () => {
    const p = pool({ maxWaiting: 1 });
    const running = p.run({ do: 'spin' });
    await new Promise((r) => setTimeout(r, 50)); // the first job leaves the queue for the worker
    const waiting = p.run({ do: 'echo', value: 1 });
    await expect(p.run({ do: 'echo', value: 2 })).rejects.toThrow('busy');
    const settled = Promise.allSettled([running, waiting]);
    await p.close();
    const [a, b] = await settled;
    expect(a.status === 'rejected' && (a.reason as Error).message).toBe('closed');
    expect(b.status === 'rejected' && (b.reason as Error).message).toBe('closed');
    await expect(p.run({ do: 'echo', value: 3 })).rejects.toThrow('closed');
  });
});
