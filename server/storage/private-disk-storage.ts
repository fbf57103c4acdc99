import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { Request } from 'express';
import type multer from 'multer';

/**
 * A multer storage engine like multer.diskStorage, but the file is created with mode 0600
 * (readable by the server's user only) and under a generated name: multer's own disk storage
 * creates files with the process's default mode (0644 under the usual umask).
 */
export function privateDiskStorage(dir: string, extension: string): multer.StorageEngine {
  return {
    _handleFile(_req: Request, file: Express.Multer.File, cb: (error?: unknown, info?: Partial<Express.Multer.File>) => void) {
      const filename = `${crypto.randomBytes(16).toString('hex')}${extension}`;
      const finalPath = path.join(dir, filename);
      fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
      const out = fs.createWriteStream(finalPath, { mode: 0o600, flags: 'wx' });
      let size = 0;
      file.stream.on('data', (chunk: Buffer) => (size += chunk.length));
      file.stream.on('error', (err) => {
        out.destroy();
        fs.rm(finalPath, { force: true }, () => cb(err));
      });
      out.on('error', (err) => cb(err));
      out.on('finish', () => cb(null, { destination: dir, filename, path: finalPath, size }));
      file.stream.pipe(out);
    },
    _removeFile(_req: Request, file: Express.Multer.File, cb: (error: Error | null) => void) {
      fs.rm(file.path, { force: true }, (err) => cb(err));
    },
  };
}
