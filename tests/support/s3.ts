// A local S3-compatible server for tests (s3rver, from npm), in-process on a free loopback port, its
// objects in a temp folder. Each test server gets its own bucket.
import { mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CreateBucketCommand } from '@aws-sdk/client-s3';
import { s3Client } from '../../server/evidence/storage';
import { freePort } from './postgres';

interface S3rverInstance {
  run(): Promise<unknown>;
  close(): Promise<void>;
}
// s3rver ships no type declarations.
const S3rver = createRequire(import.meta.url)('s3rver') as new (options: Record<string, unknown>) => S3rverInstance;

/** s3rver's fixed credentials. */
export const S3_KEY = 'S3RVER';

export interface S3Server {
  endpoint: string;
  /** The folder s3rver keeps its buckets in. */
  directory: string;
  stop(): Promise<void>;
}

export async function startS3(): Promise<S3Server> {
  const directory = mkdtempSync(join(tmpdir(), 'vf-s3-'));
  const port = await freePort();
  const server = new S3rver({ port, address: '127.0.0.1', directory, silent: true, vhostBuckets: false });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    directory,
    async stop() {
      await server.close();
      rmSync(directory, { recursive: true, force: true });
    },
  };
}

/** The environment that points a server at `bucket` on the local S3 server. */
export const s3Env = (endpoint: string, bucket: string): Record<string, string> => ({
  EVIDENCE_STORE: 's3',
  S3_ENDPOINT: endpoint,
  S3_BUCKET: bucket,
  S3_REGION: 'us-east-1',
  S3_ACCESS_KEY_ID: S3_KEY,
  S3_SECRET_ACCESS_KEY: S3_KEY,
  S3_FORCE_PATH_STYLE: 'true',
});

export async function createBucket(endpoint: string, bucket: string): Promise<void> {
  const client = s3Client({ endpoint, bucket, region: 'us-east-1', accessKeyId: S3_KEY, secretAccessKey: S3_KEY, forcePathStyle: true });
  try {
    await client.send(new CreateBucketCommand({ Bucket: bucket }));
  } finally {
    client.destroy();
  }
}
