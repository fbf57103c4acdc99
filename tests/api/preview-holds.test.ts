import { afterAll, describe, expect, it } from 'vitest';
import { previewHoldsInProcess, previewHoldsPostgres, type PreviewHolds } from '../../server/modules/calc-sheets/preview-holds';
import { pgTestDatabaseCreate, pgTestDatabasesDrop, pgTestsOn } from '../support/pg';

/**
 * The per-person count of quick draft PDFs across app processes: two hold sets on one PostgreSQL
 * database stand for two app processes (each has a pool of its own, as each process would).
 * Two holds per person in all; a third, in either process, is refused until one is released.
 */
describe('preview holds', () => {
  it('with the in-process queue a hold is always given (the printer counts in its one process)', async () => {
    const holds = previewHoldsInProcess();
    const releases = await Promise.all([1, 2, 3].map(() => holds.take(5)));
    expect(releases.every((r) => typeof r === 'function')).toBe(true);
  });

  const on = pgTestsOn();
  if (!on) console.log('Preview holds on PostgreSQL skipped: PostgreSQL project only.');
  const opened: PreviewHolds[] = [];
  afterAll(async () => {
    for (const h of opened) await h.close();
    if (on) await pgTestDatabasesDrop();
  });

  it.skipIf(!on)('on PostgreSQL, two processes share one count per person: the third hold is refused in either, another person is not, and a release frees a slot', async () => {
    const url = await pgTestDatabaseCreate();
    const app1 = previewHoldsPostgres(url);
    const app2 = previewHoldsPostgres(url);
    opened.push(app1, app2);
    const first = await app1.take(7);
    const second = await app2.take(7);
    expect(first).toBeTypeOf('function');
    expect(second).toBeTypeOf('function');
    expect(await app1.take(7)).toBeNull();
    expect(await app2.take(7)).toBeNull();
    const other = await app2.take(8);
    expect(other).toBeTypeOf('function');
    await first!();
    const again = await app2.take(7);
    expect(again).toBeTypeOf('function');
    expect(await app1.take(7)).toBeNull();
    // A process that goes away lets its holds go with its connections.
    await app2.close();
    // The server ends the dropped connections' sessions a moment later.
    let afterClose = await app1.take(7);
    for (let i = 0; i < 50 && !afterClose; i++) {
      await new Promise((r) => setTimeout(r, 100));
      afterClose = await app1.take(7);
    }
    expect(afterClose).toBeTypeOf('function');
    await afterClose!();
  });
});
