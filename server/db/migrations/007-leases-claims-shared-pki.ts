import type { Knex } from 'knex';

// What several instances on one database share beyond the rows they serve.
export async function up(knex: Knex): Promise<void> {
  // Periodic jobs run on one instance at a time: the holder renews its lease on every run; another
  // instance takes the job over once the lease has expired (ms since the epoch).
  await knex.schema.createTable('job_leases', (t) => {
    t.text('name').primary();
    t.text('holder').notNullable();
    t.bigInteger('expires_at').notNullable();
  });
  // A message is sent by the instance that claimed it; a claim that runs out (its holder died) frees it.
  await knex.schema.alterTable('mail_queue', (t) => {
    t.text('claimed_by');
    t.text('claimed_until');
  });
  // The development CA and time-stamping authority, once per database on PostgreSQL (on SQLite it stays
  // in the data folder's dev-pki.json): every instance signs with the same keys.
  await knex.schema.createTable('dev_pki', (t) => {
    t.integer('id').primary();
    t.text('pki').notNullable();
    t.text('created_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('dev_pki');
  await knex.schema.alterTable('mail_queue', (t) => {
    t.dropColumn('claimed_until');
    t.dropColumn('claimed_by');
  });
  await knex.schema.dropTable('job_leases');
}
