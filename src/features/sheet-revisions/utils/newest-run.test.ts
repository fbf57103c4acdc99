import { describe, expect, it } from 'vitest';
import type { RunStatus, RunSummaryView } from '@shared/schemas/run.schema';
import { newestSolvedRun } from './newest-run';

const run = (id: number, status: RunStatus, createdAt: string) => ({ id, status, createdAt }) as RunSummaryView;

describe('newestSolvedRun', () => {
  it('when newer runs failed or are unstable, then the newest solved one is chosen', () => {
    const runs = [run(9, 'failed', '2025-04-03T00:00:00Z'), run(8, 'unstable', '2025-04-02T00:00:00Z'), run(5, 'solved', '2025-03-01T00:00:00Z'), run(7, 'solved', '2025-04-01T00:00:00Z')];
    expect(newestSolvedRun(runs)?.id).toBe(7);
  });

  it('when no run is solved, then there is none to start a sheet from', () => {
    expect(newestSolvedRun([run(2, 'queued', '2025-04-03T00:00:00Z'), run(1, 'running', '2025-04-02T00:00:00Z')])).toBeNull();
    expect(newestSolvedRun([])).toBeNull();
  });
});
