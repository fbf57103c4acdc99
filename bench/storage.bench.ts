/**
 * npm run bench:storage — the two file stores side by side: the local private folder and the
 * S3 store through the AWS SDK against s3rver (the local S3-compatible fake the tests use, on
 * loopback, its data in a temp folder). For 100 KB, 2 MiB and 20 MiB (the default upload cap)
 * it prints the best and median of several puts, gets (whole buffer) and heads, with MB/s, and
 * the start-up HeadBucket check. s3rver writes to the same disk, so the S3 figures are the
 * SDK's and HTTP's cost on top of a disk write, not a real object store's; the machine may be
 * shared, so the load average is printed too.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { localFileStore, type FileStore } from '../server/storage/file-store';
import { s3BucketCheck, s3ClientCreate, s3FileStore } from '../server/storage/s3-store';
import { fakeS3Start } from '../tests/support/s3-fake';

const RUNS = 7;
const SIZES = [100 * 1024, 2 * 1024 * 1024, 20 * 1024 * 1024];

async function timed(f: () => Promise<unknown>): Promise<number[]> {
  await f(); // warm-up
  const out: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await f();
    out.push(performance.now() - t);
  }
  return out.sort((a, b) => a - b);
}

const ms = (v: number) => `${v.toFixed(1).padStart(7)} ms`;
const rate = (bytes: number, v: number) => `${((bytes / 1e6) / (v / 1000)).toFixed(0).padStart(5)} MB/s`;

async function measure(name: string, store: FileStore) {
  for (const size of SIZES) {
    const bytes = crypto.randomBytes(size);
    let n = 0;
    const put = await timed(() => store.put(`bench-${size}-${n++}.bin`, bytes));
    await store.put('bench-read.bin', bytes);
    const get = await timed(async () => {
      const back = await store.get('bench-read.bin');
      if (back.length !== size) throw new Error('short read');
    });
    const head = await timed(() => store.head('bench-read.bin'));
    const label = `${name.padEnd(6)} ${(size / 1024 >= 1024 ? `${size / 1024 / 1024} MiB` : `${size / 1024} KB`).padStart(7)}`;
    console.log(
      `${label}  put best ${ms(put[0])} median ${ms(put[RUNS >> 1])} (${rate(size, put[RUNS >> 1])})  ` +
        `get best ${ms(get[0])} median ${ms(get[RUNS >> 1])} (${rate(size, get[RUNS >> 1])})  head median ${ms(head[RUNS >> 1])}`,
    );
    for await (const o of store.list()) await store.delete(o.key);
  }
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-bench-store-'));
const s3 = await fakeS3Start('panelpoint-bench');
try {
  console.log(`load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}, ${os.cpus().length} CPUs; ${RUNS} runs after one warm-up`);
  await measure('local', localFileStore(dir));
  const config = s3.storage('bench');
  const client = s3ClientCreate(config);
  const check = await timed(() => s3BucketCheck(client, config));
  console.log(`S3 start-up check (HeadBucket): best ${ms(check[0])} median ${ms(check[RUNS >> 1])}`);
  await measure('s3', s3FileStore(client, config, 'drawings'));
  client.destroy();
} finally {
  await s3.close();
  fs.rmSync(dir, { recursive: true, force: true });
}
