import fs from 'node:fs/promises';
import path from 'node:path';
import type { FileStore } from './file-store';

/**
 * Start-up care of the folders the server writes to: folders 0700 and files 0600 (readable by
 * the server's user only, also for files an older version wrote with the default 0644), and
 * the sweep of uploads a crash left behind (in the local folders or the object store).
 */

/**
 * Sets each folder to 0700 and every file directly in it to 0600; returns how many changed.
 * Not recursive: the caller names the folders Panelpoint writes, so a DATA_DIR pointed at a
 * bigger folder does not have that folder's whole tree changed.
 */
export async function tightenModes(dirs: string[]): Promise<number> {
  let changed = 0;
  const walk = async (dir: string) => {
    let entries;
    try {
      entries = await fs.readdir(dir, { withFileTypes: true });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
      throw err;
    }
    const stat = await fs.stat(dir);
    if ((stat.mode & 0o777) !== 0o700) {
      await fs.chmod(dir, 0o700);
      changed++;
    }
    for (const entry of entries) {
      const at = path.join(dir, entry.name);
      if (entry.isFile()) {
        const s = await fs.stat(at);
        if ((s.mode & 0o777) !== 0o600) {
          await fs.chmod(at, 0o600);
          changed++;
        }
      }
    }
  };
  for (const dir of dirs) await walk(dir);
  return changed;
}

export interface SweepResult {
  removed: string[];
  /** Unreferenced files younger than the grace period: perhaps another process's upload in flight. */
  kept: string[];
}

/**
 * Removes objects of a store that no database row names: an upload whose request died between
 * the store's write and the drawing row, or (local folder only) a `.part` file of a write that
 * never got renamed. One younger than `graceMs` is left alone, since a second server process on
 * the same store may be about to write its row. On an object store the same sweep runs over the
 * bucket's listing: a PUT is stored whole, so there is never a `.part`, but an object whose row
 * was never written is found and removed the same way.
 */
export async function sweepOrphans(options: {
  store: FileStore;
  isReferenced: (key: string) => boolean;
  graceMs: number;
  now?: number;
}): Promise<SweepResult> {
  const now = options.now ?? Date.now();
  const result: SweepResult = { removed: [], kept: [] };
  for await (const entry of options.store.list()) {
    if (options.isReferenced(entry.key)) continue;
    if (now - entry.modifiedAt.getTime() < options.graceMs) {
      result.kept.push(entry.key);
      continue;
    }
    await options.store.delete(entry.key);
    result.removed.push(entry.key);
  }
  return result;
}
