// Another connection holding SQLite's write lock, as an admin's sqlite3 shell or a backup tool would:
// a separate process that runs BEGIN IMMEDIATE on the same file and commits only when told to.
import { spawn } from 'node:child_process';
import { resolve } from 'node:path';
import pg from 'pg';
import { WRITE_LOCK_KEY } from '../../server/db/knex';

const HOLDER = `
const Database = require('better-sqlite3');
const db = new Database(process.argv[1]);
db.exec('BEGIN IMMEDIATE');
process.stdout.write('locked\\n');
process.stdin.once('data', () => {
  db.exec('COMMIT');
  db.close();
  process.exit(0);
});
`;

export interface HeldLock {
  release(): Promise<void>;
}

/** Resolves once the other process holds the write lock on `dbFile`. */
export async function holdWriteLock(dbFile: string): Promise<HeldLock> {
  const child = spawn(process.execPath, ['-e', HOLDER, dbFile], {
    cwd: resolve(import.meta.dirname, '..', '..'),
    stdio: ['pipe', 'pipe', 'inherit'],
  });
  const exited = new Promise<void>((done) => child.once('exit', () => done()));
  await new Promise<void>((done, fail) => {
    child.stdout!.on('data', (c: Buffer) => c.toString().includes('locked') && done());
    void exited.then(() => fail(new Error('the lock holder exited before taking the lock')));
  });
  return {
    async release() {
      child.stdin!.write('go\n');
      await exited;
    },
  };
}

/**
 * PostgreSQL's counterpart: another session holds the advisory lock every write transaction takes when
 * it begins (server/db/knex.ts), as a long maintenance transaction would.
 */
export async function holdPgWriteLock(url: string): Promise<HeldLock> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  await client.query(`BEGIN; SELECT pg_advisory_xact_lock(${WRITE_LOCK_KEY});`);
  return {
    async release() {
      await client.query('COMMIT');
      await client.end();
    },
  };
}
