import { existsSync, mkdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import type { RequestHandler } from 'express';
import { AppError, StartupError, storageFault } from './errors';

/** Creates and removes a small file: the one test that also holds for root and for read-only mounts. */
function probe(dir: string): NodeJS.ErrnoException | null {
  const file = join(dir, `.write-probe-${process.pid}`);
  try {
    writeFileSync(file, '');
    rmSync(file, { force: true });
    return null;
  } catch (err) {
    return err as NodeJS.ErrnoException;
  }
}

const WHY: Record<string, string> = {
  EROFS: 'is on a read-only file system',
  EACCES: 'is not writable by this user',
  EPERM: 'is not writable by this user',
  ENOSPC: 'is on a full disk',
};

/**
 * Start-up: the data folder must exist (only the default `./data` is created on a first start — a
 * configured folder that is missing is more likely an unmounted volume than a new installation) and be
 * writable. Otherwise one line says which path and why.
 */
export function assertDataFolderUsable(dir: string, mayCreate: boolean): void {
  if (!existsSync(dir)) {
    if (!mayCreate) throw new StartupError(`data folder ${dir} does not exist (VOLTFALL_DATA_DIR); create it or mount the volume, then start again`);
    if (!existsSync(dirname(dir))) throw new StartupError(`data folder ${dir} cannot be created: ${dirname(dir)} does not exist`);
    try {
      mkdirSync(dir);
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code ?? 'error';
      throw new StartupError(`data folder ${dir} cannot be created: ${dirname(dir)} ${WHY[code] ?? `refused it (${code})`}`);
    }
  }
  if (!statSync(dir).isDirectory()) throw new StartupError(`data folder ${dir} is not a folder`);
  const err = probe(dir);
  if (err) throw new StartupError(`data folder ${dir} ${WHY[err.code ?? ''] ?? `cannot be written (${err.code ?? err.message})`}`);
}

const PROBE_EVERY_MS = 2_000;

/**
 * Refuses writes (503, or 507 when full) while the data folder cannot be written, so a read-only
 * folder refuses every change the same way instead of some failing half-way; reads go on. The probe
 * runs at most every two seconds.
 */
export function writeGuard(dir: string): RequestHandler {
  let checkedAt = 0;
  let fault: AppError | null = null;
  return (req, _res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
    const now = Date.now();
    if (now - checkedAt > PROBE_EVERY_MS) {
      checkedAt = now;
      const err = probe(dir);
      fault = err ? storageFault(err) : null;
    }
    next(fault ?? undefined);
  };
}
