import fs from 'node:fs';
import path from 'node:path';
import type { Readable } from 'node:stream';

/**
 * Where uploaded drawings and issued sheets live: one interface, filled by the local private
 * folder (the default) or by an S3-compatible object store (`s3-store.ts`). Callers name an
 * object by a key Panelpoint generated (letters, digits, `.`, `_`, `-`), never by a path and
 * never by the user's file name.
 */
export interface FileStore {
  /** Where the objects are, for the server's log: a folder path or `s3://bucket/prefix`. */
  readonly where: string;
  /** The same in words for the people using the app ("the data folder", "the object store"). */
  readonly label: string;
  /** Stores the bytes whole under the key (a reader never sees half an object). */
  put(key: string, bytes: Buffer): Promise<void>;
  /** The stored bytes; {@link StoredFileMissingError} when there is no such object. */
  get(key: string): Promise<Buffer>;
  /** The stored bytes as a stream, opened before it is returned (a missing object rejects). */
  getStream(key: string): Promise<Readable>;
  /** Size and time of the object, or null when there is none. */
  head(key: string): Promise<StoredObjectInfo | null>;
  /** Removes the object; removing one that is not there is not an error. */
  delete(key: string): Promise<void>;
  /**
   * Every object in the store, for the sweep of left-overs. The local folder lists every file
   * in it, the `.part` files of writes a crash cut short included.
   */
  list(): AsyncIterable<StoredObjectInfo & { key: string }>;
}

export interface StoredObjectInfo {
  size: number;
  modifiedAt: Date;
}

/** The key names no object in the store. */
export class StoredFileMissingError extends Error {
  readonly code = 'stored-file-missing';
  constructor(readonly key: string, where: string) {
    super(`No stored file ${key} in ${where}.`);
    this.name = 'StoredFileMissingError';
  }
}

/** The store did not answer or refused the request (network, credentials, the service itself). */
export class FileStoreUnavailableError extends Error {
  readonly code = 'file-store-unavailable';
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'FileStoreUnavailableError';
  }
}

const KEY = /^[A-Za-z0-9._-]+$/;

/** Throws unless the key is one Panelpoint could have made: no slash, no `..`, nothing else. */
export function checkKey(key: string): string {
  if (!KEY.test(key) || key === '.' || key === '..') throw new Error(`Refusing a stored-file key with path characters: ${key}`);
  return key;
}

/**
 * The local folder: created 0700, every file written 0600 (readable by the server's user
 * only) through a `.part` file renamed into place, so a crash never leaves half a file under
 * its key.
 */
export function localFileStore(dir: string, label = 'the data folder'): FileStore {
  const at = (key: string) => path.join(dir, checkKey(key));
  const missing = (key: string, err: unknown): never => {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw new StoredFileMissingError(key, dir);
    throw err;
  };
  return {
    where: dir,
    label,
    async put(key, bytes) {
      const tmp = `${at(key)}.part`;
      try {
        await fs.promises.mkdir(dir, { recursive: true, mode: 0o700 });
        // Readable by the server's user only; the rename keeps the mode.
        await fs.promises.writeFile(tmp, bytes, { mode: 0o600 });
        await fs.promises.chmod(tmp, 0o600);
        await fs.promises.rename(tmp, at(key));
      } catch (err) {
        await fs.promises.rm(tmp, { force: true }).catch(() => {});
        // A full disk or a folder that is not writable: the request gets a sentence, not a 500.
        throw new FileStoreUnavailableError(`${label[0].toUpperCase()}${label.slice(1)} could not be written (${(err as NodeJS.ErrnoException).code ?? (err as Error).message}).`, { cause: err });
      }
    },
    async get(key) {
      return fs.promises.readFile(at(key)).catch((err) => missing(key, err));
    },
    async getStream(key) {
      const handle = await fs.promises.open(at(key), 'r').catch((err) => missing(key, err));
      return handle.createReadStream();
    },
    async head(key) {
      try {
        const s = await fs.promises.stat(at(key));
        return s.isFile() ? { size: s.size, modifiedAt: s.mtime } : null;
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },
    delete: (key) => fs.promises.rm(at(key), { force: true }),
    async *list() {
      let entries: fs.Dirent[];
      try {
        entries = await fs.promises.readdir(dir, { withFileTypes: true });
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
        throw err;
      }
      for (const entry of entries) {
        if (!entry.isFile() || !KEY.test(entry.name)) continue;
        try {
          const s = await fs.promises.stat(path.join(dir, entry.name));
          yield { key: entry.name, size: s.size, modifiedAt: s.mtime };
        } catch (err) {
          // Removed meanwhile (another process's sweep or rename): nothing to list.
          if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
        }
      }
    },
  };
}
