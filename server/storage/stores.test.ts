import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadConfig, parseStorage } from '../config';
import { localFileStore, StoredFileMissingError } from './file-store';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

describe('STORAGE_URL and the S3 variables', () => {
  it('unset means the local folders (the default, no configuration)', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).storage).toEqual({ kind: 'local' });
    expect(parseStorage({ STORAGE_URL: '  ' })).toEqual({ kind: 'local' });
  });

  it('s3://bucket/prefix gives the bucket, a prefix ending in one slash, the endpoint, region and keys', () => {
    expect(
      parseStorage({ STORAGE_URL: 's3://pp-sheets/office/north/', S3_ENDPOINT: 'http://127.0.0.1:9000', AWS_ACCESS_KEY_ID: 'id', AWS_SECRET_ACCESS_KEY: 'secret' }),
    ).toEqual({ kind: 's3', bucket: 'pp-sheets', prefix: 'office/north/', endpoint: 'http://127.0.0.1:9000', region: 'us-east-1', accessKeyId: 'id', secretAccessKey: 'secret' });
    expect(parseStorage({ STORAGE_URL: 's3://pp-sheets', S3_REGION: 'eu-west-1' })).toMatchObject({ prefix: '', region: 'eu-west-1', endpoint: undefined, accessKeyId: undefined });
  });

  // Amazon S3 User Guide, "General purpose bucket naming rules": 3 to 63 characters; lowercase
  // letters, numbers, dots and hyphens; begin and end with a letter or number; no two adjacent
  // periods; not formatted as an IP address.
  it.each([
    ['ab', 'shorter than 3'],
    ['a'.repeat(64), 'longer than 63'],
    ['Sheets', 'upper case'],
    ['sheets_2026', 'underscore'],
    ['-sheets', 'hyphen first'],
    ['sheets.', 'dot last'],
    ['my..sheets', 'two adjacent dots'],
    ['192.168.5.4', 'an IP address'],
  ])('refuses the bucket name %s (%s) with one sentence naming STORAGE_URL', (bucket) => {
    expect(() => parseStorage({ STORAGE_URL: `s3://${bucket}` })).toThrow(/^Configuration: the bucket ".*" in STORAGE_URL is not a valid bucket name/);
  });

  it.each(['abc', 'a'.repeat(63), 'my.sheets-2026', '0firm'])('takes the bucket name %s', (bucket) => {
    expect(parseStorage({ STORAGE_URL: `s3://${bucket}` })).toMatchObject({ kind: 's3', bucket });
  });

  it('refuses other schemes, a prefix with .. or odd characters, an endpoint without http(s) and half a key pair, each naming the variable', () => {
    expect(() => parseStorage({ STORAGE_URL: 'file:///srv/sheets' })).toThrow(/STORAGE_URL must look like s3:\/\/bucket/);
    expect(() => parseStorage({ STORAGE_URL: 's3://pp-sheets/../other' })).toThrow(/prefix "\.\.\/other" in STORAGE_URL/);
    expect(() => parseStorage({ STORAGE_URL: 's3://pp-sheets/a b' })).toThrow(/prefix "a b" in STORAGE_URL/);
    expect(() => parseStorage({ STORAGE_URL: 's3://pp-sheets', S3_ENDPOINT: '127.0.0.1:9000' })).toThrow(/^Configuration: S3_ENDPOINT must be an http:\/\/ or https:\/\/ address/);
    expect(() => parseStorage({ STORAGE_URL: 's3://pp-sheets', AWS_SECRET_ACCESS_KEY: 's' })).toThrow(/AWS_SECRET_ACCESS_KEY is set but AWS_ACCESS_KEY_ID is not/);
    // Through loadConfig, as the server reads it.
    expect(() => loadConfig({ STORAGE_URL: 'gs://pp-sheets' })).toThrow(/^Configuration: STORAGE_URL/);
  });
});

describe('the local folder store', () => {
  const fresh = () => {
    const d = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-store-'));
    dirs.push(d);
    return path.join(d, 'sheets');
  };

  it('puts a file 0600 in a 0700 folder, reads it back as buffer and stream, heads, lists and deletes it', async () => {
    const dir = fresh();
    const store = localFileStore(dir);
    await store.put('a.pdf', Buffer.from('%PDF-1.4 demo'));
    // POSIX permission bits read back with fs.stat.
    expect((fs.statSync(dir).mode & 0o777).toString(8)).toBe('700');
    expect((fs.statSync(path.join(dir, 'a.pdf')).mode & 0o777).toString(8)).toBe('600');
    expect((await store.get('a.pdf')).toString()).toBe('%PDF-1.4 demo');
    const chunks: Buffer[] = [];
    for await (const c of await store.getStream('a.pdf')) chunks.push(c as Buffer);
    expect(Buffer.concat(chunks).toString()).toBe('%PDF-1.4 demo');
    expect(await store.head('a.pdf')).toMatchObject({ size: 13 });
    const listed = [];
    for await (const o of store.list()) listed.push(o.key);
    expect(listed).toEqual(['a.pdf']);
    await store.delete('a.pdf');
    await store.delete('a.pdf'); // not there: not an error
    expect(await store.head('a.pdf')).toBeNull();
    expect(fs.readdirSync(dir)).toEqual([]);
  });

  it('a missing key is a StoredFileMissingError for get and getStream; a key with path characters is refused', async () => {
    const store = localFileStore(fresh());
    await expect(store.get('gone.pdf')).rejects.toBeInstanceOf(StoredFileMissingError);
    await expect(store.getStream('gone.pdf')).rejects.toBeInstanceOf(StoredFileMissingError);
    for (const key of ['../escape.pdf', 'a/b.pdf', '..', '']) await expect(store.get(key)).rejects.toThrow(/Refusing a stored-file key/);
  });
});
