import path from 'node:path';
import type { Config } from '../config';
import { localFileStore, type FileStore } from './file-store';
import { s3BucketCheck, s3ClientCreate, s3FileStore } from './s3-store';

/** The two stores the server keeps files in, and the folders a local install writes. */
export interface FileStores {
  kind: 'local' | 's3';
  /** Uploaded drawings. */
  drawings: FileStore;
  /** Issued (and superseded) calc sheets, kept as issued. */
  sheets: FileStore;
  /** Draft calc sheet PDFs of print jobs (any process may print one, any app process serves it). */
  printJobs: FileStore;
  /** Local folders to create and keep 0700 with 0600 files: none on an object store. */
  folders: string[];
  close(): void;
}

/** The issued-sheets folder of a local install. */
export const issuedSheetsDir = (config: Pick<Config, 'dataDir'>) => path.join(config.dataDir, 'issued-sheets');

/**
 * The stores STORAGE_URL chooses: unset, the uploads folder, DATA_DIR/issued-sheets and DATA_DIR/print-jobs; with
 * s3://bucket[/prefix], the areas `drawings/`, `issued-sheets/` and `print-jobs/` of that bucket, checked with
 * HeadBucket first so a wrong bucket, wrong credentials or an unreachable endpoint stop the start.
 */
export async function fileStoresOpen(config: Pick<Config, 'storage' | 'uploadsDir' | 'dataDir'>): Promise<FileStores> {
  const storage = config.storage;
  if (storage.kind === 'local') {
    const sheetsDir = issuedSheetsDir(config);
    return {
      kind: 'local',
      drawings: localFileStore(config.uploadsDir, 'the uploads folder'),
      sheets: localFileStore(sheetsDir, 'the data folder'),
      printJobs: localFileStore(path.join(config.dataDir, 'print-jobs'), 'the data folder'),
      folders: [config.uploadsDir, sheetsDir],
      close() {},
    };
  }
  const client = s3ClientCreate(storage);
  try {
    await s3BucketCheck(client, storage);
  } catch (err) {
    client.destroy();
    throw err;
  }
  return {
    kind: 's3',
    drawings: s3FileStore(client, storage, 'drawings'),
    sheets: s3FileStore(client, storage, 'issued-sheets'),
    printJobs: s3FileStore(client, storage, 'print-jobs'),
    folders: [],
    close: () => client.destroy(),
  };
}
