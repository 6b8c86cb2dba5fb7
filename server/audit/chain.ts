import { createHash } from 'node:crypto';
import type { Knex } from 'knex';

interface AuditInput {
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId: string | number;
  dossierId?: number | null;
  payload?: unknown;
}

interface AuditEvent {
  id: number;
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId: string;
  dossierId: number | null;
  payload: unknown;
  createdAt: string;
  prevHash: string;
  hash: string;
}

const GENESIS = '0'.repeat(64);

interface AuditRow {
  id: number;
  actor_id: string | null;
  action: string;
  subject_type: string;
  subject_id: string;
  dossier_id: number | null;
  payload: string;
  created_at: string;
  prev_hash: string;
  hash: string;
}

// SHA-256 over the previous hash and every field of the event, so editing, removing or
// reordering any row breaks every hash after it.
function eventHash(row: Omit<AuditRow, 'id' | 'hash'>): string {
  const material = JSON.stringify([
    row.prev_hash,
    row.actor_id,
    row.action,
    row.subject_type,
    row.subject_id,
    row.dossier_id,
    row.payload,
    row.created_at,
  ]);
  return createHash('sha256').update(material).digest('hex');
}

/** Appends one event to the chain; call inside the transaction that makes the change it records. */
export async function appendAudit(trx: Knex | Knex.Transaction, input: AuditInput): Promise<void> {
  const last = await trx<AuditRow>('audit_event').orderBy('id', 'desc').first('hash');
  const row = {
    actor_id: input.actorId,
    action: input.action,
    subject_type: input.subjectType,
    subject_id: String(input.subjectId),
    dossier_id: input.dossierId ?? null,
    payload: JSON.stringify(input.payload ?? {}),
    created_at: new Date().toISOString(),
    prev_hash: last?.hash ?? GENESIS,
  };
  await trx('audit_event').insert({ ...row, hash: eventHash(row) });
}

interface ChainReport {
  verified: boolean;
  firstBroken: { id: number; reason: string } | null;
  events: AuditEvent[];
}

/** Walks the whole chain (any tampering counts) and returns the events of one dossier, or all. */
export async function readAuditChain(db: Knex, dossierId?: number): Promise<ChainReport> {
  const rows = await db<AuditRow>('audit_event').orderBy('id', 'asc');
  let prev = GENESIS;
  let firstBroken: ChainReport['firstBroken'] = null;
  for (const row of rows) {
    if (row.prev_hash !== prev) {
      firstBroken = { id: row.id, reason: 'does not link to the event before it (an event was removed or edited)' };
      break;
    }
    if (eventHash(row) !== row.hash) {
      firstBroken = { id: row.id, reason: 'its content no longer matches its hash (the event was edited)' };
      break;
    }
    prev = row.hash;
  }
  const events = rows
    .filter((r) => dossierId === undefined || r.dossier_id === dossierId)
    .map((r) => ({
      id: r.id,
      actorId: r.actor_id,
      action: r.action,
      subjectType: r.subject_type,
      subjectId: r.subject_id,
      dossierId: r.dossier_id,
      payload: JSON.parse(r.payload) as unknown,
      createdAt: r.created_at,
      prevHash: r.prev_hash,
      hash: r.hash,
    }));
  return { verified: firstBroken === null, firstBroken, events };
}
