import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import pg from 'pg';
import { migrationSource } from './migration-source';

export type Db = Knex;

/** Which SQL dialect a connection speaks; stores branch on it only where the two must differ. */
export type Dialect = 'sqlite' | 'pg';

export function dialectOf(db: Knex | Knex.Transaction): Dialect {
  return (db.client.config as { client?: unknown }).client === 'pg' || db.client.dialect === 'postgresql' ? 'pg' : 'sqlite';
}

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

/**
 * The key of the advisory lock every PostgreSQL write transaction takes when it begins: the same
 * guarantee SQLite's BEGIN IMMEDIATE gives (one writer at a time, reads never wait), held by the
 * database, so it holds across every instance that shares it.
 */
export const WRITE_LOCK_KEY = 7_317_001;

const PgTransaction = require('knex/lib/dialects/postgres/execution/pg-transaction') as new (...args: unknown[]) => {
  query(conn: unknown, sql: string): Promise<unknown>;
  trxClient: { query(conn: unknown, sql: string): Promise<unknown> };
  _completed: boolean;
  _rejecter(err: unknown): void;
};
const PgClient = require('knex/lib/dialects/postgres') as new (config: Knex.Config) => object;

function pgClient() {
  class WriteLockTransaction extends PgTransaction {
    async begin(conn: unknown) {
      try {
        await this.trxClient.query(conn, `BEGIN; SELECT pg_advisory_xact_lock(${WRITE_LOCK_KEY});`);
      } catch (err) {
        // A lock wait that timed out leaves the connection in an aborted transaction: end it before the
        // connection goes back to the pool, or every later query on it fails. Then fail the transaction
        // the way Knex fails one whose BEGIN failed.
        await this.trxClient.query(conn, 'ROLLBACK').catch(() => undefined);
        this._completed = true;
        this._rejecter(err);
      }
    }
  }
  return class PostgresClient extends PgClient {
    transaction(...args: unknown[]) {
      return new WriteLockTransaction(this, ...args);
    }
  };
}

// PostgreSQL's 64-bit integers (counts, the ms timestamps of sessions) arrive as strings unless parsed;
// every such value here is far below 2^53. JSON columns (jsonb) are handed over as their text, as
// SQLite's are, so the stores parse both the same way.
pg.types.setTypeParser(pg.types.builtins.INT8, (v: string) => Number(v));
pg.types.setTypeParser(pg.types.builtins.JSONB, (v: string) => v);
pg.types.setTypeParser(pg.types.builtins.JSON, (v: string) => v);

/** Knex on PostgreSQL: `busyTimeoutMs` bounds how long a statement waits for a lock, then it answers 503. */
export function pgKnexConfig(url: string, busyTimeoutMs = BUSY_TIMEOUT_MS, poolMax = 10): Knex.Config {
  const timeout = Math.round(busyTimeoutMs);
  return {
    client: pgClient() as unknown as typeof Knex.Client,
    connection: { connectionString: url, options: `-c lock_timeout=${timeout} -c TimeZone=UTC` },
    pool: { min: 0, max: poolMax },
    migrations: { migrationSource },
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

export interface OpenOptions {
  busyTimeoutMs?: number;
  /** `false` for cluster workers, whose primary migrated before forking them. */
  migrate?: boolean;
  /** A `postgres://` URL (DATABASE_URL): PostgreSQL instead of the SQLite file in the data folder. */
  url?: string | null;
}

/** Opens the database: PostgreSQL when a URL is given, otherwise the SQLite file in the data folder. */
export async function openDatabase(dataDir: string, options: OpenOptions = {}): Promise<Db> {
  let db: Db;
  if (options.url) {
    db = knexFactory(pgKnexConfig(options.url, options.busyTimeoutMs));
  } else {
    mkdirSync(dataDir, { recursive: true });
    db = knexFactory(knexConfig(databaseFile(dataDir), options.busyTimeoutMs));
  }
  if (options.migrate ?? true) await migrateLatest(db);
  return db;
}

/**
 * Migrates to the latest schema. On PostgreSQL several instances may start at once: a session-level
 * advisory lock lets one migrate while the others wait (Knex's own lock row would make them fail).
 */
async function migrateLatest(db: Db): Promise<void> {
  if (dialectOf(db) === 'sqlite') {
    await db.migrate.latest();
    return;
  }
  const conn = await db.client.acquireConnection();
  try {
    await conn.query(`SELECT pg_advisory_lock(${WRITE_LOCK_KEY + 1})`);
    try {
      await db.migrate.latest();
    } finally {
      await conn.query(`SELECT pg_advisory_unlock(${WRITE_LOCK_KEY + 1})`);
    }
  } finally {
    await db.client.releaseConnection(conn);
  }
}
