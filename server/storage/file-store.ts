import fs from 'node:fs/promises';
import path from 'node:path';

/**
 * Where uploaded drawings and issued sheets live. One small interface so that an object
 * store can take the local folder's place; names are generated, never the user's.
 */
export interface FileStore {
  read(name: string): Promise<Buffer>;
  write(name: string, bytes: Buffer): Promise<void>;
  remove(name: string): Promise<void>;
}

export function localFileStore(dir: string): FileStore {
  const at = (name: string) => {
    if (!/^[A-Za-z0-9._-]+$/.test(name)) throw new Error(`Refusing a stored-file name with path characters: ${name}`);
    return path.join(dir, name);
  };
  return {
    read: (name) => fs.readFile(at(name)),
    async write(name, bytes) {
      await fs.mkdir(dir, { recursive: true, mode: 0o700 });
      const tmp = `${at(name)}.part`;
      // Readable by the server's user only; the rename keeps the mode.
      await fs.writeFile(tmp, bytes, { mode: 0o600 });
      await fs.chmod(tmp, 0o600);
      await fs.rename(tmp, at(name));
    },
    remove: (name) => fs.rm(at(name), { force: true }),
  };
}
