import type { Knex } from 'knex';
import { dropTrigger, isPg, pgContentChanged, pgGuard, pgRevisionStatusGuard, REVISION_CONTENT_COLUMNS } from '../guards';

// The frozen-content trigger of 003, extended by `version`: a draft's version moves with every stored
// change, a submitted revision's never does.
const FROZEN_CONTENT = (extra: string) => `CREATE TRIGGER revision_frozen_content BEFORE UPDATE ON revision
    WHEN OLD.status <> 'draft' AND (NEW.design IS NOT OLD.design OR NEW.notes IS NOT OLD.notes
      OR NEW.results IS NOT OLD.results OR NEW.engine_version IS NOT OLD.engine_version
      OR NEW.content_hash IS NOT OLD.content_hash OR NEW.author_id IS NOT OLD.author_id
      OR NEW.number IS NOT OLD.number OR NEW.dossier_id IS NOT OLD.dossier_id
      OR NEW.created_from IS NOT OLD.created_from OR NEW.submitted_at IS NOT OLD.submitted_at${extra})
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: submitted revisions cannot change'); END`;

const pgFrozenContent = (knex: Knex, columns: string[]) =>
  pgGuard(
    knex,
    'revision_frozen_content',
    'revision',
    'UPDATE',
    `OLD.status <> 'draft' AND (${pgContentChanged(columns)})`,
    'revision is frozen: submitted revisions cannot change',
  );

export async function up(knex: Knex): Promise<void> {
  // Optimistic concurrency: every stored change of a draft adds one, and a write names the version it
  // was based on, so two tabs or two people cannot silently overwrite each other.
  await knex.schema.alterTable('revision', (t) => {
    t.integer('version').notNullable().defaultTo(1);
  });
  await dropTrigger(knex, 'revision_frozen_content', 'revision');
  if (isPg(knex)) await pgFrozenContent(knex, [...REVISION_CONTENT_COLUMNS, 'version']);
  else await knex.raw(FROZEN_CONTENT(' OR NEW.version IS NOT OLD.version'));

  // Review comments belong to the review: none before submission, none once decided.
  const noComment = 'revision is frozen: comments are taken only while it is in review';
  if (isPg(knex)) await pgRevisionStatusGuard(knex, 'review_comment_in_review', 'review_comment', 'INSERT', 'in_review', noComment);
  else
    await knex.raw(`CREATE TRIGGER review_comment_in_review BEFORE INSERT ON review_comment
    WHEN (SELECT status FROM revision WHERE id = NEW.revision_id) IS NOT 'in_review'
    BEGIN SELECT RAISE(ABORT, '${noComment}'); END`);

  // When a draft's removal left a stored file without any evidence row; the file is kept for a grace
  // period from then. A file with no row and no entry here never belonged to anything (an upload
  // interrupted between placing the file and committing its row) and goes at the next sweep.
  await knex.schema.createTable('evidence_release', (t) => {
    t.text('sha256').primary();
    t.text('released_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('evidence_release');
  await dropTrigger(knex, 'review_comment_in_review', 'review_comment');
  await dropTrigger(knex, 'revision_frozen_content', 'revision');
  if (isPg(knex)) await pgFrozenContent(knex, REVISION_CONTENT_COLUMNS);
  else await knex.raw(FROZEN_CONTENT(''));
  // Plain SQL: Knex would rebuild the table to drop a column, and with it lose the other triggers.
  await knex.raw('ALTER TABLE revision DROP COLUMN version');
}
