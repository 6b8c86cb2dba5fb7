import type { Knex } from 'knex';
import { dropTrigger, isPg, pgGuard } from '../guards';

// The lists (dossiers, overview, review queue) read each revision's verdict from its own column and
// page through indexes, instead of parsing every revision's results JSON.

/** Runs `change` with one trigger lifted, then restores the trigger exactly as it was stored. */
async function withoutTrigger(knex: Knex, name: string, change: () => Promise<void>): Promise<void> {
  if (isPg(knex)) {
    await knex.raw(`ALTER TABLE revision DISABLE TRIGGER ${name}`);
    await change();
    await knex.raw(`ALTER TABLE revision ENABLE TRIGGER ${name}`);
    return;
  }
  const row = await knex('sqlite_master').where({ type: 'trigger', name }).first('sql');
  if (!row) return change();
  await knex.raw(`DROP TRIGGER ${name}`);
  await change();
  await knex.raw(row.sql);
}

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE revision ADD COLUMN verdict TEXT NOT NULL DEFAULT 'incomplete'
    CHECK (verdict IN ('meets', 'fails', 'incomplete'))`);
  // Backfill: decided revisions refuse every update, so their guard is lifted for this one statement.
  await withoutTrigger(knex, 'revision_decided_frozen', async () => {
    await knex.raw(
      isPg(knex)
        ? `UPDATE revision SET verdict = coalesce(results->>'verdict', 'incomplete')`
        : `UPDATE revision SET verdict = coalesce(json_extract(results, '$.verdict'), 'incomplete')`,
    );
  });
  if (isPg(knex)) await pgVerdictGuards(knex);
  else await sqliteVerdictGuards(knex);

  // One index per list filter and order.
  await knex.raw('CREATE INDEX dossier_product ON dossier(product_id, id)');
  await knex.raw('CREATE INDEX revision_status_submitted ON revision(status, submitted_at, id)');
  await knex.raw('CREATE INDEX revision_status_decided ON revision(status, decided_at, id)');
  await knex.raw('CREATE INDEX revision_author_status ON revision(author_id, status, updated_at, id)');
  await knex.raw('CREATE INDEX revision_verdict ON revision(verdict)');
}

// The column can never disagree with the results it summarises, whoever writes the row.
async function sqliteVerdictGuards(knex: Knex): Promise<void> {
  for (const event of ['INSERT', 'UPDATE'] as const) {
    await knex.raw(`CREATE TRIGGER revision_verdict_matches_${event.toLowerCase()} BEFORE ${event} ON revision
      WHEN NEW.verdict IS NOT coalesce(json_extract(NEW.results, '$.verdict'), 'incomplete')
      BEGIN SELECT RAISE(ABORT, 'revision verdict must match its results'); END`);
  }
  await knex.raw(`CREATE TRIGGER revision_frozen_verdict BEFORE UPDATE OF verdict ON revision
    WHEN OLD.status <> 'draft' AND NEW.verdict IS NOT OLD.verdict
    BEGIN SELECT RAISE(ABORT, 'revision is frozen: submitted revisions cannot change'); END`);
}

// The same guards in PostgreSQL's terms.
async function pgVerdictGuards(knex: Knex): Promise<void> {
  for (const event of ['INSERT', 'UPDATE'] as const) {
    await pgGuard(
      knex,
      `revision_verdict_matches_${event.toLowerCase()}`,
      'revision',
      event,
      `NEW.verdict IS DISTINCT FROM coalesce(NEW.results->>'verdict', 'incomplete')`,
      'revision verdict must match its results',
    );
  }
  await pgGuard(
    knex,
    'revision_frozen_verdict',
    'revision',
    'UPDATE OF verdict',
    `OLD.status <> 'draft' AND NEW.verdict IS DISTINCT FROM OLD.verdict`,
    'revision is frozen: submitted revisions cannot change',
  );
}

export async function down(knex: Knex): Promise<void> {
  for (const index of ['revision_verdict', 'revision_author_status', 'revision_status_decided', 'revision_status_submitted', 'dossier_product']) {
    await knex.raw(`DROP INDEX ${index}`);
  }
  for (const trigger of ['revision_frozen_verdict', 'revision_verdict_matches_update', 'revision_verdict_matches_insert']) {
    await dropTrigger(knex, trigger, 'revision');
  }
  await knex.raw('ALTER TABLE revision DROP COLUMN verdict');
}
