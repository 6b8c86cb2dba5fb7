import type { Knex } from 'knex';
import * as m001 from './migrations/001-users-and-sessions';
import * as m002 from './migrations/002-mail-and-audit';
import * as m003 from './migrations/003-dossiers-and-revisions';
import * as m004 from './migrations/004-revision-version-and-file-release';
import * as m005 from './migrations/005-sessions-throttle-signatures';
import * as m006 from './migrations/006-revision-verdict-and-list-indexes';
import * as m007 from './migrations/007-leases-claims-shared-pki';

interface Migration {
  up(knex: Knex): Promise<void>;
  down(knex: Knex): Promise<void>;
}

// A static list: Knex's file-system loader cannot import .ts files under vitest.
const migrations: Record<string, Migration> = {
  '001-users-and-sessions': m001,
  '002-mail-and-audit': m002,
  '003-dossiers-and-revisions': m003,
  '004-revision-version-and-file-release': m004,
  '005-sessions-throttle-signatures': m005,
  '006-revision-verdict-and-list-indexes': m006,
  '007-leases-claims-shared-pki': m007,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(migrations),
  getMigrationName: (name) => name,
  getMigration: async (name) => migrations[name],
};
