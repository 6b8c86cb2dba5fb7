import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  // Sessions now keep an absolute and an idle expiry (ms since the epoch) and store only the SHA-256 of
  // the cookie's token. Rows of the earlier format cannot be carried over, so everyone signs in again.
  await knex.schema.dropTable('session');
  await knex.schema.createTable('session', (t) => {
    t.text('id').primary();
    t.text('user_id').notNullable().references('user.id').onDelete('CASCADE');
    t.bigInteger('created_at').notNullable();
    t.bigInteger('expires_at').notNullable();
    t.bigInteger('idle_expires_at').notNullable();
    t.index(['user_id', 'created_at']);
    t.index(['expires_at']);
    t.index(['idle_expires_at']);
  });

  // Failed attempts per key ("account:<e-mail>", "address:<ip>", …), kept in the database so the
  // throttle holds across restarts and across instances sharing the database.
  await knex.schema.createTable('throttle_bucket', (t) => {
    t.text('key').primary();
    t.integer('failures').notNullable();
    t.bigInteger('last_failure_at').notNullable();
  });

  // One table for every one-time link: invitations and password resets.
  await knex.raw(`ALTER TABLE invite ADD COLUMN kind TEXT NOT NULL DEFAULT 'invite' CHECK (kind IN ('invite', 'reset'))`);
  await knex.raw('ALTER TABLE invite ADD COLUMN revoked_at TEXT');
  await knex.schema.alterTable('invite', (t) => {
    t.index(['user_id', 'kind']);
  });

  // Approving is an electronic signature: who signed, in which role, and what the signature means.
  // Decisions recorded before this migration keep these empty (nothing was re-entered for them).
  await knex.raw('ALTER TABLE review_decision ADD COLUMN signer_name TEXT');
  await knex.raw('ALTER TABLE review_decision ADD COLUMN signer_role TEXT');
  await knex.raw('ALTER TABLE review_decision ADD COLUMN meaning TEXT');
}

export async function down(knex: Knex): Promise<void> {
  for (const column of ['meaning', 'signer_role', 'signer_name']) await knex.raw(`ALTER TABLE review_decision DROP COLUMN ${column}`);
  await knex.schema.alterTable('invite', (t) => {
    t.dropIndex(['user_id', 'kind']);
  });
  await knex.raw('ALTER TABLE invite DROP COLUMN revoked_at');
  await knex.raw('ALTER TABLE invite DROP COLUMN kind');
  await knex.schema.dropTable('throttle_bucket');
  await knex.schema.dropTable('session');
  await knex.schema.createTable('session', (t) => {
    t.text('id').primary();
    t.integer('expires_at').notNullable();
    t.text('user_id').notNullable().references('user.id').onDelete('CASCADE');
    t.index(['user_id']);
  });
}
