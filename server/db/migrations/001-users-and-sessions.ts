import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('user', (t) => {
    t.text('id').primary();
    t.text('email').notNullable().unique();
    t.text('name').notNullable();
    t.text('role').notNullable().checkIn(['admin', 'engineer', 'reviewer', 'viewer']);
    t.text('password_hash');
    t.text('disabled_at');
    t.text('created_at').notNullable();
  });
  // Column names are the ones the session adapter expects.
  await knex.schema.createTable('session', (t) => {
    t.text('id').primary();
    t.integer('expires_at').notNullable();
    t.text('user_id').notNullable().references('user.id').onDelete('CASCADE');
    t.index(['user_id']);
  });
  await knex.schema.createTable('invite', (t) => {
    t.increments('id');
    t.text('user_id').notNullable().references('user.id').onDelete('CASCADE');
    t.text('token_hash').notNullable().unique();
    t.text('expires_at').notNullable();
    t.text('used_at');
    t.text('created_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invite');
  await knex.schema.dropTable('session');
  await knex.schema.dropTable('user');
}
