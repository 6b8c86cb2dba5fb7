import { createHash } from 'node:crypto';
import { createReadStream, createWriteStream, existsSync, mkdirSync } from 'node:fs';
import { readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, NoSuchKey, NotFound, S3Client } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';
import type { Config, S3Settings } from '../config';
import { tempFileName } from '../housekeeping/temp-files';

export const SHA256_NAME = /^[0-9a-f]{64}$/;

/** What a store holds: captures and attachments, or signed dossiers. */
export type ContentKind = 'evidence' | 'dossiers';

export interface StoredObject {
  name: string;
  /** When it was written (ms since the epoch). */
  modifiedAt: number;
}

/**
 * Bytes kept under their SHA-256, the same bytes twice stored once: a folder of the data folder, or an
 * S3-compatible bucket. Uploads are hashed and analysed in a local staging file first (the capture
 * analysis reads it with positioned reads in bounded memory), then placed.
 */
export interface ContentStore {
  /** Where uploads in progress are written; the temp-file sweep keeps it clean. */
  readonly stagingDir: string;
  /**
   * Moves a finished staging file to its content address and removes the staging file. Call it inside
   * the transaction that records the row: the orphan sweep decides under the write lock, so it never
   * sees the stored bytes without their row.
   */
  place(stagingPath: string, sha256: string): Promise<{ created: boolean }>;
  /** Stores bytes already in memory (a signed PDF) under their SHA-256. */
  putBytes(sha256: string, bytes: Buffer): Promise<{ created: boolean }>;
  /** A stream of the stored bytes, or null when they are missing. */
  open(sha256: string): Promise<{ stream: Readable; size: number } | null>;
  remove(sha256: string): Promise<void>;
  /** Every stored object named by a SHA-256. */
  list(): Promise<StoredObject[]>;
  /** Removes a staging file (an upload that failed or was refused). */
  discard(stagingPath: string): Promise<void>;
}

const keyOf = (sha256: string) => {
  if (!SHA256_NAME.test(sha256)) throw new Error('not a sha256 storage key');
  return sha256;
};

/** One file per SHA-256 under `<dataDir>/<kind>/`; staging files in its `tmp/` (same disk, so placing is a rename). */
export class FolderStore implements ContentStore {
  readonly dir: string;
  readonly stagingDir: string;

  constructor(dataDir: string, kind: ContentKind) {
    this.dir = join(dataDir, kind);
    // Signed dossiers were always staged beside the files themselves.
    this.stagingDir = kind === 'evidence' ? join(this.dir, 'tmp') : this.dir;
    mkdirSync(this.stagingDir, { recursive: true });
  }

  pathOf(sha256: string): string {
    return join(this.dir, keyOf(sha256));
  }

  async place(stagingPath: string, sha256: string): Promise<{ created: boolean }> {
    const target = this.pathOf(sha256);
    if (existsSync(target)) {
      await rm(stagingPath, { force: true });
      return { created: false };
    }
    await rename(stagingPath, target);
    return { created: true };
  }

  async putBytes(sha256: string, bytes: Buffer): Promise<{ created: boolean }> {
    const temp = join(this.stagingDir, tempFileName());
    await writeFile(temp, bytes);
    return this.place(temp, sha256);
  }

  async open(sha256: string): Promise<{ stream: Readable; size: number } | null> {
    const path = this.pathOf(sha256);
    try {
      const { size } = await stat(path);
      return { stream: createReadStream(path), size };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw err;
    }
  }

  async remove(sha256: string): Promise<void> {
    await rm(this.pathOf(sha256), { force: true });
  }

  async list(): Promise<StoredObject[]> {
    const names = (await readdir(this.dir).catch(() => [] as string[])).filter((n) => SHA256_NAME.test(n));
    return Promise.all(names.map(async (name) => ({ name, modifiedAt: (await stat(join(this.dir, name)).catch(() => ({ mtimeMs: 0 }))).mtimeMs })));
  }

  async discard(stagingPath: string): Promise<void> {
    await rm(stagingPath, { force: true });
  }
}

/** Parts of 8 MiB, two in flight: a large capture goes up as a multipart upload without being held in memory. */
const PART_BYTES = 8 * 1024 * 1024;

export function s3Client(s3: S3Settings): S3Client {
  return new S3Client({
    region: s3.region,
    endpoint: s3.endpoint ?? undefined,
    forcePathStyle: s3.forcePathStyle,
    credentials: s3.accessKeyId && s3.secretAccessKey ? { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey } : undefined,
  });
}

const missing = (err: unknown) =>
  err instanceof NoSuchKey || err instanceof NotFound || (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404;

/**
 * Objects `<kind>/<sha256>` in an S3-compatible bucket, streamed both ways. Staging files live in the
 * system's temporary folder, outside the data folder, and are gone once the object is stored.
 */
export class S3Store implements ContentStore {
  readonly stagingDir: string;
  private readonly prefix: string;

  constructor(
    private readonly client: S3Client,
    private readonly bucket: string,
    kind: ContentKind,
  ) {
    this.prefix = `${kind}/`;
    this.stagingDir = join(tmpdir(), `voltfall-staging-${kind}`);
    mkdirSync(this.stagingDir, { recursive: true });
  }

  private async exists(key: string): Promise<boolean> {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return true;
    } catch (err) {
      if (missing(err)) return false;
      throw err;
    }
  }

  private async upload(sha256: string, body: Readable | Buffer): Promise<{ created: boolean }> {
    const key = this.prefix + keyOf(sha256);
    if (await this.exists(key)) return { created: false };
    await new Upload({ client: this.client, params: { Bucket: this.bucket, Key: key, Body: body }, partSize: PART_BYTES, queueSize: 2 }).done();
    return { created: true };
  }

  async place(stagingPath: string, sha256: string): Promise<{ created: boolean }> {
    try {
      return await this.upload(sha256, createReadStream(stagingPath));
    } finally {
      await rm(stagingPath, { force: true });
    }
  }

  putBytes(sha256: string, bytes: Buffer): Promise<{ created: boolean }> {
    return this.upload(sha256, bytes);
  }

  async open(sha256: string): Promise<{ stream: Readable; size: number } | null> {
    try {
      const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: this.prefix + keyOf(sha256) }));
      return { stream: res.Body as Readable, size: Number(res.ContentLength ?? 0) };
    } catch (err) {
      if (missing(err)) return null;
      throw err;
    }
  }

  async remove(sha256: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: this.prefix + keyOf(sha256) }));
  }

  async list(): Promise<StoredObject[]> {
    const found: StoredObject[] = [];
    let token: string | undefined;
    do {
      const page = await this.client.send(new ListObjectsV2Command({ Bucket: this.bucket, Prefix: this.prefix, ContinuationToken: token }));
      for (const o of page.Contents ?? []) {
        const name = (o.Key ?? '').slice(this.prefix.length);
        if (SHA256_NAME.test(name)) found.push({ name, modifiedAt: o.LastModified?.getTime() ?? 0 });
      }
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
    return found;
  }

  async discard(stagingPath: string): Promise<void> {
    await rm(stagingPath, { force: true });
  }
}

/** The store the configuration names, for one kind of content. */
export function openContentStore(config: Pick<Config, 'dataDir' | 'evidenceStore'>, kind: ContentKind): ContentStore {
  if (config.evidenceStore.kind === 's3') return new S3Store(s3Client(config.evidenceStore.s3), config.evidenceStore.s3.bucket, kind);
  return new FolderStore(config.dataDir, kind);
}

/** Reads a stored object whole (signed PDFs, a few megabytes; evidence is always streamed). */
export async function readWhole(store: ContentStore, sha256: string): Promise<Buffer | null> {
  const opened = await store.open(sha256);
  if (!opened) return null;
  const chunks: Buffer[] = [];
  for await (const chunk of opened.stream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

export interface HashedFile {
  path: string;
  size: number;
  sha256: string;
}

/**
 * A multer storage engine that streams the upload to a staging file while hashing it, so a
 * half-megabyte or half-gigabyte file is read once and never held in memory. When the client goes away
 * or the form breaks off, multer destroys the stream and the partial file is removed here.
 */
export function hashingStorage(store: ContentStore): StorageEngine {
  return {
    _handleFile(_req: Request, file, cb) {
      const path = join(store.stagingDir, tempFileName());
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
