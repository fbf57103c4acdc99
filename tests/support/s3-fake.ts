import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { S3Client } from '@aws-sdk/client-s3';
import type { S3StorageConfig } from '../../server/storage/s3-store';

/** s3rver's built-in account (its README: "accessKeyId: S3RVER, secretAccessKey: S3RVER"). */
export const FAKE_S3_KEY = 'S3RVER';

export interface FakeS3 {
  endpoint: string;
  bucket: string;
  /** A storage config for the server on this fake, under the given prefix. */
  storage(prefix?: string): S3StorageConfig;
  /** The same as environment variables, for a spawned server. */
  env(prefix?: string): Record<string, string>;
  /** A client of its own, for the test to look into or tamper with the bucket directly. */
  client: S3Client;
  close(): Promise<void>;
}

/**
 * A local S3-compatible server (s3rver, from npm) on a free loopback port with its data in a
 * temp folder, with one bucket made. Started by the tests themselves, stopped by `close()`.
 * s3rver checks the access key id but does not check SigV4 signatures (its authentication
 * middleware: "Signature version 4 calculation is unimplemented"), so a wrong secret is not
 * refused by it; a wrong key id is.
 */
export async function fakeS3Start(bucket = 'panelpoint-test'): Promise<FakeS3> {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-s3-'));
  const server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory, configureBuckets: [{ name: bucket, configs: [] }] });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  const storage = (prefix = ''): S3StorageConfig => ({
    kind: 's3',
    bucket,
    prefix: prefix ? `${prefix.replace(/\/+$/, '')}/` : '',
    endpoint,
    region: 'us-east-1',
    accessKeyId: FAKE_S3_KEY,
    secretAccessKey: FAKE_S3_KEY,
  });
  const client = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: FAKE_S3_KEY, secretAccessKey: FAKE_S3_KEY } });
  let closed = false;
  return {
    endpoint,
    bucket,
    storage,
    env: (prefix = '') => ({
      STORAGE_URL: `s3://${bucket}${prefix ? `/${prefix}` : ''}`,
      S3_ENDPOINT: endpoint,
      S3_REGION: 'us-east-1',
      AWS_ACCESS_KEY_ID: FAKE_S3_KEY,
      AWS_SECRET_ACCESS_KEY: FAKE_S3_KEY,
    }),
    client,
    async close() {
      if (closed) return;
      closed = true;
      client.destroy();
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

/** A loopback port nothing listens on (bound once by us, then released). */
export async function closedPort(): Promise<number> {
  const srv = net.createServer();
  await new Promise<void>((resolve) => srv.listen(0, '127.0.0.1', resolve));
  const port = (srv.address() as net.AddressInfo).port;
  await new Promise<void>((resolve) => srv.close(() => resolve()));
  return port;
}
