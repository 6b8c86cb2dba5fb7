import type { Knex } from 'knex';
import { createPgGuardFunctions, isPg, pgGuard } from '../guards';

export async function up(knex: Knex): Promise<void> {
  // Messages waiting to be handed to the SMTP relay; a state change and its e-mail commit together.
  await knex.schema.createTable('mail_queue', (t) => {
    t.increments('id');
    t.text('to').notNullable();
    t.text('subject').notNullable();
    t.text('text').notNullable();
    t.text('html').notNullable();
    t.text('status').notNullable().defaultTo('pending').checkIn(['pending', 'sent', 'failed']);
    t.integer('attempts').notNullable().defaultTo(0);
    t.text('next_attempt_at').notNullable();
    t.text('last_error');
    t.text('created_at').notNullable();
    t.text('sent_at');
    t.index(['status', 'next_attempt_at']);
  });
  // What the local fake SMTP server received (development and tests only).
  await knex.schema.createTable('mail_outbox', (t) => {
    t.increments('id');
    t.text('from').notNullable();
    t.text('to').notNullable();
    t.text('subject').notNullable();
    t.text('text').notNullable();
    t.text('html');
    t.text('received_at').notNullable();
  });
  await knex.schema.createTable('audit_event', (t) => {
    t.increments('id');
    t.text('actor_id');
    t.text('action').notNullable();
    t.text('subject_type').notNullable();
    t.text('subject_id').notNullable();
    t.integer('dossier_id');
    // Text on both databases, never jsonb: the hash chain covers these exact characters.
    t.text('payload').notNullable();
    t.text('created_at').notNullable();
    t.text('prev_hash').notNullable();
    t.text('hash').notNullable();
    t.index(['dossier_id']);
  });
  if (isPg(knex)) {
    await createPgGuardFunctions(knex);
    await pgGuard(knex, 'audit_event_no_update', 'audit_event', 'UPDATE', null, 'audit events are append-only');
    await pgGuard(knex, 'audit_event_no_delete', 'audit_event', 'DELETE', null, 'audit events are append-only');
    return;
  }
  await knex.raw(`CREATE TRIGGER audit_event_no_update BEFORE UPDATE ON audit_event
    BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END`);
  await knex.raw(`CREATE TRIGGER audit_event_no_delete BEFORE DELETE ON audit_event
    BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_event');
  await knex.schema.dropTable('mail_outbox');
  await knex.schema.dropTable('mail_queue');
}
