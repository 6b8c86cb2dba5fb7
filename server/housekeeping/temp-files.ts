import { randomBytes } from 'node:crypto';
import { readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';

// `<pid>-<ms>-<random>.part`: the writing process's id lets a sweep tell a dead process's leftovers
// from a live worker's upload in progress.
const TEMP_NAME = /^(\d+)-\d+-[0-9a-f]+\.part$/;

/** A fresh temporary file name, for bytes that are renamed to their final name once complete. */
export function tempFileName(): string {
  return `${process.pid}-${Date.now()}-${randomBytes(8).toString('hex')}.part`;
}

function processIsAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: it exists but belongs to someone else.
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Removes temporary files that no upload or signing will finish: older than `maxAgeMs`, or written by
 * a process that is gone. At start-up `ownFilesAreStale` also removes this process id's files — a
 * restarted container often gets its predecessor's pid, and a fresh process has nothing in progress.
 */
export async function sweepTempFiles(dirs: readonly string[], maxAgeMs: number, ownFilesAreStale: boolean, now = Date.now()): Promise<string[]> {
  const removed: string[] = [];
  for (const dir of dirs) {
    const names = await readdir(dir).catch((err: NodeJS.ErrnoException) => {
      if (err.code === 'ENOENT') return [] as string[];
      throw err;
    });
    for (const name of names) {
      const owner = TEMP_NAME.exec(name);
      if (!owner && !name.endsWith('.part')) continue;
      const path = join(dir, name);
      const pid = owner ? Number(owner[1]) : null;
      const ownerGone = pid === null || pid === process.pid ? ownFilesAreStale : !processIsAlive(pid);
      const info = await stat(path).catch(() => null);
      if (!info) continue;
      if (ownerGone || now - info.mtimeMs > maxAgeMs) {
        await rm(path, { force: true });
        removed.push(path);
      }
    }
  }
  return removed;
}
