import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { migrationSource } from './migration-source';

export type Db = Knex;

/** How long a connection waits for another process's write lock by default; then the request answers 503. */
export const BUSY_TIMEOUT_MS = 5000;

export function databaseFile(dataDir: string): string {
  return join(dataDir, 'voltfall.sqlite3');
}

// Knex's own classes, reached by path because it exports no way to change how a transaction begins.
const require = createRequire(import.meta.url);
const BetterSqlite3Client = require('knex/lib/dialects/better-sqlite3') as new (config: Knex.Config) => object;
const SqliteTransaction = require('knex/lib/dialects/sqlite3/execution/sqlite-transaction') as new (...args: unknown[]) => {
  trxClient: { query(conn: unknown, sql: string): Promise<unknown> };
  query(conn: unknown, sql: string): Promise<unknown>;
};

interface RawConnection {
  pragma(source: string): unknown;
}

const isBusy = (err: unknown) => (err as { code?: string } | null)?.code === 'SQLITE_BUSY';

/**
 * Transactions take the write lock when they begin. Several workers share the file: a deferred
 * transaction that reads and then writes fails at once with SQLITE_BUSY when another process wrote
 * meanwhile, while an immediate one waits for the lock instead. It waits asynchronously: SQLite's own
 * busy wait would freeze the worker's event loop (better-sqlite3 is synchronous), so BEGIN is tried
 * without it and retried after a short random pause until the busy timeout has passed.
 */
function sqliteClient(busyTimeoutMs: number) {
  class ImmediateTransaction extends SqliteTransaction {
    async begin(conn: RawConnection) {
      const deadline = Date.now() + busyTimeoutMs;
      conn.pragma('busy_timeout = 0');
      try {
        // Attempts go straight to the connection: a failed query through Knex's transaction ends the transaction.
        while (Date.now() < deadline) {
          try {
            return await this.trxClient.query(conn, 'BEGIN IMMEDIATE;');
          } catch (err) {
            if (!isBusy(err)) break;
            await new Promise((resolve) => setTimeout(resolve, 1 + Math.random() * 9));
          }
        }
        // The last try through Knex, which rejects the transaction if it fails too.
        return await this.query(conn, 'BEGIN IMMEDIATE;');
      } finally {
        conn.pragma(`busy_timeout = ${busyTimeoutMs}`);
      }
    }
  }

  return class SqliteClient extends BetterSqlite3Client {
    transaction(...args: unknown[]) {
      return new ImmediateTransaction(this, ...args);
    }
  };
}

export function knexConfig(file: string, busyTimeoutMs = BUSY_TIMEOUT_MS): Knex.Config {
  const timeout = Math.round(busyTimeoutMs);
  return {
    client: sqliteClient(timeout) as unknown as typeof Knex.Client,
    connection: { filename: file },
    useNullAsDefault: true,
    pool: {
      min: 1,
      max: 1,
      // SQLite settings are per connection, so they are applied as each one opens.
      afterCreate(conn: { pragma: (s: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        conn.pragma('journal_mode = WAL');
        conn.pragma('foreign_keys = ON');
        conn.pragma(`busy_timeout = ${timeout}`);
        conn.pragma('synchronous = NORMAL');
        done(null, conn);
      },
    },
    migrations: { migrationSource },
  };
}

/** Opens the database; `migrate: false` for cluster workers, whose primary migrated before forking them. */
export async function openDatabase(dataDir: string, options: { busyTimeoutMs?: number; migrate?: boolean } = {}): Promise<Db> {
  mkdirSync(dataDir, { recursive: true });
  const db = knexFactory(knexConfig(databaseFile(dataDir), options.busyTimeoutMs));
  if (options.migrate ?? true) await db.migrate.latest();
  return db;
}
