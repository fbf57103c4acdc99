import type { Readable } from 'node:stream';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { checkKey, FileStoreUnavailableError, StoredFileMissingError, type FileStore } from './file-store';

/** An S3-compatible object store, as STORAGE_URL=s3://bucket[/prefix] and the S3_* variables say. */
export interface S3StorageConfig {
  kind: 's3';
  bucket: string;
  /** '' or a prefix ending in '/', put before every key. */
  prefix: string;
  /** S3_ENDPOINT: another S3-compatible service than AWS (path-style addresses then). */
  endpoint?: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
}

export function s3ClientCreate(config: S3StorageConfig): S3Client {
  return new S3Client({
    region: config.region,
    ...(config.endpoint ? { endpoint: config.endpoint, forcePathStyle: true } : {}),
    ...(config.accessKeyId && config.secretAccessKey ? { credentials: { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey } } : {}),
    // Checksums only where the S3 API requires them: several S3-compatible services do not
    // take the SDK's newer default CRC32 headers, and every stored file is checked against its
    // own SHA-256 by Panelpoint anyway (drawings and issued sheets keep theirs in the database).
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    // A store that does not answer fails the request in seconds, not after the OS's minutes.
    requestHandler: { connectionTimeout: 5000, requestTimeout: 60_000 },
    maxAttempts: 3,
  });
}

const statusOf = (err: unknown) => (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
const NETWORK_CODES = new Set(['ECONNREFUSED', 'ENOTFOUND', 'EAI_AGAIN', 'ETIMEDOUT', 'ECONNRESET', 'EHOSTUNREACH', 'ENETUNREACH', 'EPIPE']);

/** The network reason of a failed request in words ("connection refused"), or null when the store answered. */
function networkReason(err: unknown): string | null {
  const e = err as { code?: string; name?: string; cause?: { code?: string } };
  const code = e.code ?? e.cause?.code;
  if (code === 'ECONNREFUSED') return 'connection refused';
  if (code === 'ENOTFOUND' || code === 'EAI_AGAIN') return 'no such host';
  if (code && NETWORK_CODES.has(code)) return code;
  if (e.name === 'TimeoutError' || e.name === 'RequestTimeout') return 'no answer in time';
  return null;
}

/**
 * One area of the bucket (drawings, issued sheets) as a {@link FileStore}: the object key is
 * `prefix + area + '/' + key`. A PUT stores an object whole, so no half-written object can
 * appear under a key.
 */
export function s3FileStore(client: S3Client, config: S3StorageConfig, area: string): FileStore {
  const base = `${config.prefix}${area}/`;
  const where = `s3://${config.bucket}/${base}`;
  const objectKey = (key: string) => `${base}${checkKey(key)}`;
  const unavailable = (what: string, err: unknown): never => {
    const status = statusOf(err);
    const reason = networkReason(err) ?? (status ? `HTTP ${status}` : (err as Error).message?.slice(0, 200) || String(err));
    throw new FileStoreUnavailableError(`The object store did not ${what} (${reason}).`, { cause: err });
  };
  const isMissing = (err: unknown) => {
    const name = (err as { name?: string }).name;
    return name === 'NoSuchKey' || name === 'NotFound' || statusOf(err) === 404;
  };
  const open = async (key: string) => {
    try {
      const out = await client.send(new GetObjectCommand({ Bucket: config.bucket, Key: objectKey(key) }));
      return out.Body as Readable & { transformToByteArray(): Promise<Uint8Array> };
    } catch (err) {
      if (isMissing(err)) throw new StoredFileMissingError(key, where);
      return unavailable('hand out a stored file', err);
    }
  };
  return {
    where,
    label: 'the object store',
    async put(key, bytes) {
      try {
        await client.send(new PutObjectCommand({ Bucket: config.bucket, Key: objectKey(key), Body: bytes, ContentLength: bytes.length }));
      } catch (err) {
        unavailable('take the file', err);
      }
    },
    async get(key) {
      const body = await open(key);
      try {
        return Buffer.from(await body.transformToByteArray());
      } catch (err) {
        return unavailable('hand out the whole file', err);
      }
    },
    getStream: open,
    async head(key) {
      try {
        const out = await client.send(new HeadObjectCommand({ Bucket: config.bucket, Key: objectKey(key) }));
        return { size: out.ContentLength ?? 0, modifiedAt: out.LastModified ?? new Date(0) };
      } catch (err) {
        if (isMissing(err)) return null;
        return unavailable('say whether a file is stored', err);
      }
    },
    async delete(key) {
      try {
        await client.send(new DeleteObjectCommand({ Bucket: config.bucket, Key: objectKey(key) }));
      } catch (err) {
        if (!isMissing(err)) unavailable('remove a file', err);
      }
    },
    async *list() {
      let token: string | undefined;
      do {
        let page;
        try {
          page = await client.send(new ListObjectsV2Command({ Bucket: config.bucket, Prefix: base, ContinuationToken: token }));
        } catch (err) {
          return unavailable('list its files', err);
        }
        for (const o of page.Contents ?? []) {
          const key = o.Key?.slice(base.length) ?? '';
          // Only keys Panelpoint makes; anything else in the bucket is not ours to sweep.
          if (!/^[A-Za-z0-9._-]+$/.test(key)) continue;
          yield { key, size: o.Size ?? 0, modifiedAt: o.LastModified ?? new Date() };
        }
        token = page.IsTruncated ? page.NextContinuationToken : undefined;
      } while (token);
    },
  };
}

/**
 * The start-up check: HeadBucket on the configured bucket. Anything but a yes stops the start
 * with one sentence naming the variable to correct.
 */
export async function s3BucketCheck(client: S3Client, config: S3StorageConfig): Promise<void> {
  const at = config.endpoint ? `S3_ENDPOINT (${config.endpoint})` : `the AWS S3 service of S3_REGION (${config.region})`;
  try {
    await client.send(new HeadBucketCommand({ Bucket: config.bucket }));
    return;
  } catch (err) {
    const status = statusOf(err);
    const name = (err as { name?: string }).name ?? '';
    const net = networkReason(err);
    if (net) {
      throw new Error(`Object storage: could not reach ${at}: ${net}; check the address in S3_ENDPOINT${config.endpoint ? '' : ' or S3_REGION'} and that the store is running.`);
    }
    if (name === 'CredentialsProviderError') {
      throw new Error('Object storage: no credentials for the S3 store; set AWS_ACCESS_KEY_ID and AWS_SECRET_ACCESS_KEY.');
    }
    if (status === 404 || name === 'NotFound' || name === 'NoSuchBucket') {
      throw new Error(`Object storage: the bucket "${config.bucket}" named in STORAGE_URL does not exist at ${at}; create it or correct STORAGE_URL.`);
    }
    if (status === 403 || status === 401) {
      throw new Error(
        `Object storage: ${at} refused the credentials for bucket "${config.bucket}" (HTTP ${status}); check AWS_ACCESS_KEY_ID and AWS_SECRET_ACCESS_KEY, and that they may read and write that bucket.`,
      );
    }
    if (status === 301 || status === 400) {
      throw new Error(`Object storage: the bucket "${config.bucket}" is not in the region S3_REGION says (${config.region}); set S3_REGION to the bucket's region.`);
    }
    throw new Error(`Object storage: the check of bucket "${config.bucket}" at ${at} failed (${status ? `HTTP ${status}` : (err as Error).message}); check STORAGE_URL and S3_ENDPOINT.`);
  }
}
