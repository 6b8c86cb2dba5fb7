// The parts of the migrations where PostgreSQL differs from SQLite: JSON columns and the triggers that
// keep frozen rows frozen. SQLite states a trigger's condition in its WHEN clause and aborts with RAISE
// (the migrations keep that SQL as it was); PostgreSQL runs a plpgsql function. Both refuse the
// statement inside the database, whoever sends it.
import type { Knex } from 'knex';
import { dialectOf } from './knex';

export const isPg = (knex: Knex) => dialectOf(knex) === 'pg';

/** A JSON document column: `jsonb` on PostgreSQL, text on SQLite (whose JSON functions read text). */
export function jsonColumn(knex: Knex, t: Knex.CreateTableBuilder | Knex.AlterTableBuilder, name: string): Knex.ColumnBuilder {
  return isPg(knex) ? t.jsonb(name) : t.text(name);
}

/** Defines, once, the plpgsql functions the PostgreSQL triggers call. */
export async function createPgGuardFunctions(knex: Knex): Promise<void> {
  // Refuses the statement with the message given as the trigger's argument.
  await knex.raw(`CREATE OR REPLACE FUNCTION voltfall_refuse() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION '%', TG_ARGV[0] USING ERRCODE = 'restrict_violation';
    END $$`);
  // Refuses unless the row's revision has the status given as the first argument (a trigger's WHEN
  // clause cannot read another table on PostgreSQL).
  await knex.raw(`CREATE OR REPLACE FUNCTION voltfall_require_revision_status() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      current_status text;
    BEGIN
      SELECT status INTO current_status FROM revision
        WHERE id = CASE WHEN TG_OP = 'INSERT' THEN NEW.revision_id ELSE OLD.revision_id END;
      IF current_status IS DISTINCT FROM TG_ARGV[0] THEN
        RAISE EXCEPTION '%', TG_ARGV[1] USING ERRCODE = 'restrict_violation';
      END IF;
      IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
      RETURN NEW;
    END $$`);
}

const quoted = (text: string) => `'${text.replace(/'/g, "''")}'`;

/** PostgreSQL: a trigger that refuses the statement when `when` holds (null: always). */
export async function pgGuard(knex: Knex, name: string, table: string, event: string, when: string | null, message: string): Promise<void> {
  await knex.raw(
    `CREATE TRIGGER ${name} BEFORE ${event} ON ${table} FOR EACH ROW ${when ? `WHEN (${when})` : ''}
      EXECUTE FUNCTION voltfall_refuse(${quoted(message)})`,
  );
}

/** PostgreSQL: a trigger that refuses the statement unless the row's revision has `status`. */
export async function pgRevisionStatusGuard(knex: Knex, name: string, table: string, event: string, status: string, message: string): Promise<void> {
  await knex.raw(
    `CREATE TRIGGER ${name} BEFORE ${event} ON ${table} FOR EACH ROW
      EXECUTE FUNCTION voltfall_require_revision_status(${quoted(status)}, ${quoted(message)})`,
  );
}

export async function dropTrigger(knex: Knex, name: string, table: string): Promise<void> {
  await knex.raw(isPg(knex) ? `DROP TRIGGER ${name} ON ${table}` : `DROP TRIGGER ${name}`);
}

/** The revision columns frozen once it is submitted (migration 003; 004 adds `version`). */
export const REVISION_CONTENT_COLUMNS = [
  'design',
  'notes',
  'results',
  'engine_version',
  'content_hash',
  'author_id',
  'number',
  'dossier_id',
  'created_from',
  'submitted_at',
];

/** `IS DISTINCT FROM` is PostgreSQL's spelling of SQLite's `IS NOT`. */
export const pgContentChanged = (columns: string[]) => columns.map((c) => `NEW.${c} IS DISTINCT FROM OLD.${c}`).join(' OR ');
