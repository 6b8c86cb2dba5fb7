import { createHash } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';
import { tempFileName } from '../housekeeping/temp-files';

export const SHA256_NAME = /^[0-9a-f]{64}$/;

/** Where evidence bytes live: one file per SHA-256 under `<dataDir>/evidence/`, uploads land in `tmp/` first. */
export class EvidenceStore {
  readonly dir: string;
  readonly tmpDir: string;

  constructor(dataDir: string) {
    this.dir = join(dataDir, 'evidence');
    this.tmpDir = join(this.dir, 'tmp');
    mkdirSync(this.tmpDir, { recursive: true });
  }

  pathOf(sha256: string): string {
    if (!SHA256_NAME.test(sha256)) throw new Error('not a sha256 storage key');
    return join(this.dir, sha256);
  }

  /**
   * Moves a finished upload to its content address; the same bytes twice are stored once. Call it inside
   * the transaction that records the evidence row: the orphan sweep decides under the write lock, so it
   * never sees this file without its row.
   */
  async place(tmpPath: string, sha256: string): Promise<{ created: boolean }> {
    const target = this.pathOf(sha256);
    if (existsSync(target)) {
      await rm(tmpPath, { force: true });
      return { created: false };
    }
    await rename(tmpPath, target);
    return { created: true };
  }

  async discard(path: string): Promise<void> {
    await rm(path, { force: true });
  }
}

export interface HashedFile {
  path: string;
  size: number;
  sha256: string;
}

/**
 * A multer storage engine that streams the upload to a temporary file while hashing it, so a
 * half-megabyte or half-gigabyte file is read once and never held in memory. When the client goes away
 * or the form breaks off, multer destroys the stream and the partial file is removed here.
 */
export function hashingStorage(store: EvidenceStore): StorageEngine {
  return {
    _handleFile(_req: Request, file, cb) {
      const path = join(store.tmpDir, tempFileName());
      const hash = createHash('sha256');
      let size = 0;
      file.stream.on('data', (chunk: Buffer) => {
        hash.update(chunk);
        size += chunk.length;
      });
      pipeline(file.stream, createWriteStream(path))
        .then(() => cb(null, { path, size, sha256: hash.digest('hex') } as Partial<Express.Multer.File>))
        .catch(async (err: Error) => {
          await store.discard(path);
          cb(err);
        });
    },
    _removeFile(_req: Request, file, cb) {
      store.discard(file.path).then(() => cb(null), cb);
    },
  };
}
