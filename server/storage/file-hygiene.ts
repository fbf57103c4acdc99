import fs from 'node:fs/promises';
import path from 'node:path';

/**
 * Start-up care of the folders the server writes to: folders 0700 and files 0600 (readable by
 * the server's user only, also for files an older version wrote with the default 0644), and
 * the sweep of uploads a crash left behind.
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
 * Removes files in `dir` (not in its sub-folders) that no database row names: an upload whose
 * request died between multer writing the file and the drawing row being stored, or a `.part`
 * file of a write that never got renamed. A file younger than `graceMs` is left alone, since a
 * second server process on the same folder may be about to store its row.
 */
export async function sweepOrphans(options: {
  dir: string;
  isReferenced: (name: string) => boolean;
  graceMs: number;
  now?: number;
}): Promise<SweepResult> {
  const now = options.now ?? Date.now();
  const result: SweepResult = { removed: [], kept: [] };
  let entries;
  try {
    entries = await fs.readdir(options.dir, { withFileTypes: true });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return result;
    throw err;
  }
  for (const entry of entries) {
    if (!entry.isFile() || options.isReferenced(entry.name)) continue;
    const at = path.join(options.dir, entry.name);
    const stat = await fs.stat(at);
    if (now - stat.mtimeMs < options.graceMs) {
      result.kept.push(entry.name);
      continue;
    }
    await fs.rm(at, { force: true });
    result.removed.push(entry.name);
  }
  return result;
}
