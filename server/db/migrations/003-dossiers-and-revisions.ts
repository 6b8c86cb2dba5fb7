import type { Knex } from 'knex';
import { isPg, jsonColumn, pgContentChanged, pgGuard, pgRevisionStatusGuard, REVISION_CONTENT_COLUMNS } from '../guards';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('product', (t) => {
    t.increments('id');
    t.text('name').notNullable();
    t.text('model_number').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.text('created_by').notNullable().references('user.id');
    t.text('created_at').notNullable();
  });
  await knex.schema.createTable('dossier', (t) => {
    t.increments('id');
    t.integer('product_id').notNullable().references('product.id');
    t.text('title').notNullable();
    jsonColumn(knex, t, 'requirement').notNullable();
    t.text('created_by').notNullable().references('user.id');
    t.text('created_at').notNullable();
  });
  await knex.schema.createTable('revision', (t) => {
    t.increments('id');
    t.integer('dossier_id').notNullable().references('dossier.id');
    t.integer('number').notNullable();
    t.text('status').notNullable().defaultTo('draft').checkIn(['draft', 'in_review', 'approved', 'returned']);
    jsonColumn(knex, t, 'design').notNullable();
    t.text('notes').notNullable().defaultTo('');
    jsonColumn(knex, t, 'results').notNullable();
    t.text('engine_version').notNullable();
    t.text('author_id').notNullable().references('user.id');
    t.integer('created_from').references('revision.id');
    t.text('content_hash');
    t.text('created_at').notNullable();
    t.text('updated_at').notNullable();
    t.text('submitted_at');
    t.text('decided_at');
    t.unique(['dossier_id', 'number']);
  });
  // At most one open draft per dossier.
  await knex.raw(`CREATE UNIQUE INDEX revision_one_draft ON revision(dossier_id) WHERE status = 'draft'`);
  // Frozen means frozen, whatever writes to the file: only a draft's content may change, and the
  // status may only move along draft → in_review → approved | returned.
  if (isPg(knex)) await pgRevisionGuards(knex);
  else await sqliteRevisionGuards(knex);

  // One stored file per sha256; a revision's evidence rows point at it, so a new draft
  // references the same bytes instead of copying them.
  await knex.schema.createTable('evidence', (t) => {
    t.increments('id');
    t.integer('revision_id').notNullable().references('revision.id');
    t.text('kind').notNullable().checkIn(['waveform', 'image', 'datasheet', 'report', 'other']);
    t.text('original_name').notNullable();
    t.text('media_type').notNullable();
    t.integer('size').notNullable();
    t.text('sha256').notNullable();
    t.text('storage_key').notNullable();
    jsonColumn(knex, t, 'analysis');
    jsonColumn(knex, t, 'analysis_options');
    t.text('uploaded_by').notNullable().references('user.id');
    t.text('uploaded_at').notNullable();
    t.index(['revision_id']);
    t.index(['sha256']);
  });
  for (const [event, row] of [
    ['INSERT', 'NEW'],
    ['UPDATE', 'OLD'],
    ['DELETE', 'OLD'],
  ] as const) {
    if (isPg(knex)) {
      const name = `evidence_frozen_${event.toLowerCase()}`;
      await pgRevisionStatusGuard(knex, name, 'evidence', event, 'draft', 'revision is frozen: its evidence list cannot change');
      continue;
    }
    await knex.raw(`CREATE TRIGGER evidence_frozen_${event.toLowerCase()} BEFORE ${event} ON evidence
      WHEN (SELECT status FROM revision WHERE id = ${row}.revision_id) <> 'draft'
      BEGIN SELECT RAISE(ABORT, 'revision is frozen: its evidence list cannot change'); END`);
  }

  await knex.schema.createTable('review_decision', (t) => {
    t.increments('id');
    t.integer('revision_id').notNullable().references('revision.id');
    t.text('reviewer_id').notNullable().references('user.id');
    t.text('decision').notNullable().checkIn(['approve', 'return']);
    t.text('comment').notNullable().defaultTo('');
    t.text('content_hash').notNullable();
    t.text('created_at').notNullable();
    t.unique(['revision_id']);
  });
  await refuseChanges(knex, 'review_decision', 'review decisions are final');

  // Review comments that are not decisions (questions while in review).
  await knex.schema.createTable('review_comment', (t) => {
    t.increments('id');
    t.integer('revision_id').notNullable().references('revision.id');
    t.text('author_id').notNullable().references('user.id');
    t.text('body').notNullable();
    t.text('created_at').notNullable();
  });

  // The signed PDF of an approved revision, generated once and served as stored.
  await knex.schema.createTable('signed_dossier', (t) => {
    t.increments('id');
    t.integer('revision_id').notNullable().unique().references('revision.id');
    t.text('sha256').notNullable();
    t.text('storage_key').notNullable();
    t.integer('size').notNullable();
    t.text('signer_subject').notNullable();
    t.text('signer_kind').notNullable();
    t.text('created_at').notNullable();
  });
  await refuseChanges(knex, 'signed_dossier', 'signed dossiers are final');
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['signed_dossier', 'review_comment', 'review_decision', 'evidence', 'revision', 'dossier', 'product']) {
    await knex.schema.dropTable(table);
  }
}

async function sqliteRevisionGuards(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TRIGGER revision_frozen_content BEFORE UPDATE ON revision
    WHEN OLD.status <> 'draft' AND (NEW.design IS NOT OLD.design OR NEW.notes IS NOT OLD.notes
      OR NEW.results IS NOT OLD.results OR NEW.engine_version IS NOT OLD.engine_version
      OR NEW.content_hash IS NOT OLD.content_hash OR NEW.author_id IS NOT OLD.author_id
      OR NEW.number IS NOT OLD.number OR NEW.dossier_id IS NOT OLD.dossier_id
      OR NEW.created_from IS NOT OLD.created_from OR NEW.submitted_at IS NOT OLD.submitted_at)
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: submitted revisions cannot change'); END`);
  await knex.raw(`CREATE TRIGGER revision_status_flow BEFORE UPDATE OF status ON revision
    WHEN NOT ((OLD.status = 'draft' AND NEW.status IN ('draft', 'in_review'))
      OR (OLD.status = 'in_review' AND NEW.status IN ('in_review', 'approved', 'returned'))
      OR (OLD.status = NEW.status AND OLD.status = 'draft'))
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: this status change is not allowed'); END`);
  await knex.raw(`CREATE TRIGGER revision_decided_frozen BEFORE UPDATE ON revision
    WHEN OLD.status IN ('approved', 'returned')
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: decided revisions cannot change'); END`);
  await knex.raw(`CREATE TRIGGER revision_no_delete BEFORE DELETE ON revision
    WHEN OLD.status <> 'draft'
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: submitted revisions cannot be deleted'); END`);
}

/** The revision guards above, in PostgreSQL's terms. */
async function pgRevisionGuards(knex: Knex): Promise<void> {
  await pgGuard(
    knex,
    'revision_frozen_content',
    'revision',
    'UPDATE',
    `OLD.status <> 'draft' AND (${pgContentChanged(REVISION_CONTENT_COLUMNS)})`,
    'revision is frozen: submitted revisions cannot change',
  );
  await pgGuard(
    knex,
    'revision_status_flow',
    'revision',
    'UPDATE OF status',
    `NOT ((OLD.status = 'draft' AND NEW.status IN ('draft', 'in_review'))
      OR (OLD.status = 'in_review' AND NEW.status IN ('in_review', 'approved', 'returned')))`,
    'revision is frozen: this status change is not allowed',
  );
  await pgGuard(
    knex,
    'revision_decided_frozen',
    'revision',
    'UPDATE',
    `OLD.status IN ('approved', 'returned')`,
    'revision is frozen: decided revisions cannot change',
  );
  await pgGuard(
    knex,
    'revision_no_delete',
    'revision',
    'DELETE',
    `OLD.status <> 'draft'`,
    'revision is frozen: submitted revisions cannot be deleted',
  );
}

/** Rows of `table` can be added, never changed or removed. */
async function refuseChanges(knex: Knex, table: string, message: string): Promise<void> {
  for (const event of ['UPDATE', 'DELETE'] as const) {
    const name = `${table}_no_${event.toLowerCase()}`;
    if (isPg(knex)) await pgGuard(knex, name, table, event, null, message);
    else
      await knex.raw(`CREATE TRIGGER ${name} BEFORE ${event} ON ${table}
      BEGIN SELECT RAISE(ABORT, '${message}'); END`);
  }
}
