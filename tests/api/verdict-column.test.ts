// The verdict column (migration 006) says what the stored results say, from the first draft to the
// frozen record, and the migration fills it for revisions written before it existed.
import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { computeDischarge } from '../../shared/engine';
import { databaseFile, knexConfig } from '../../server/db/knex';
import { demoDesign, demoRequirement, failingDesign } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const stored = async (id: number) => {
  const row = await server.ctx.db('revision').where({ id }).first('verdict', 'results');
  return { column: row.verdict as string, json: JSON.parse(row.results).verdict as string | undefined };
};

describe('the verdict column follows the results', () => {
  it('when a draft is created, saved failing, saved passing and submitted, then the column matches the stored results every time', async () => {
    const engineer = await server.signIn('engineer');
    const products = (await engineer.get('/api/products')).body;
    const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Verdict story', requirement: demoRequirement }))
      .body;
    const id = dossier.revisions[0].id as number;
    expect(await stored(id)).toEqual({ column: 'incomplete', json: 'incomplete' });
    await saveDraft(engineer, id, { design: failingDesign });
    expect(await stored(id)).toEqual({ column: 'fails', json: 'fails' });
    await saveDraft(engineer, id, { design: demoDesign });
    expect(await stored(id)).toEqual({ column: 'meets', json: 'meets' });
    await engineer.post(`/api/revisions/${id}/submit`);
    expect(await stored(id)).toEqual({ column: 'meets', json: 'meets' });
    const listed = (await engineer.get(`/api/dossiers?q=${encodeURIComponent('Verdict story')}`)).body.items[0];
    expect(listed.latest).toMatchObject({ id, status: 'in_review', verdict: 'meets' });
  });

  it('when anything writes a verdict that disagrees with the results, then the database refuses it', async () => {
    const draft = await server.ctx.db('revision').where({ status: 'draft' }).first('id');
    await expect(
      server.ctx
        .db('revision')
        .where({ id: draft.id })
        .update({ verdict: 'meets', results: JSON.stringify({ verdict: 'fails' }) }),
    ).rejects.toThrow(/verdict must match/);
  });

  it('when a revision is submitted, then its verdict is frozen with it', async () => {
    const frozen = await server.ctx.db('revision').whereNot({ status: 'draft' }).first('id', 'verdict');
    const other = frozen.verdict === 'meets' ? 'fails' : 'meets';
    await expect(server.ctx.db('revision').where({ id: frozen.id }).update({ verdict: other })).rejects.toThrow(/frozen/);
  });
});

describe('migration 006 fills the column for existing revisions', () => {
  it('when revisions in every state exist before the migration, then each gets the verdict of its results and decided ones stay frozen', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'vf-backfill-'));
    const db = knexFactory(knexConfig(databaseFile(dir)));
    try {
      // The schema as it was before 006: run the migrations listed before it, one at a time.
      for (;;) {
        const [, pending] = (await db.migrate.list()) as [unknown, Array<{ file: string } | string>];
        const next = pending.map((p) => (typeof p === 'string' ? p : p.file))[0];
        if (!next || next >= '006') break;
        await db.migrate.up();
      }
      const userId = randomUUID();
      const now = new Date().toISOString();
      await db('user').insert({ id: userId, email: 'backfill@fennel.test', name: 'Backfill', role: 'engineer', created_at: now });
      const [product] = await db('product').insert({ name: 'P', model_number: 'M', created_by: userId, created_at: now }).returning('id');
      const results = {
        meets: computeDischarge({ requirement: demoRequirement, design: demoDesign }),
        fails: computeDischarge({ requirement: demoRequirement, design: failingDesign }),
        incomplete: computeDischarge({ requirement: demoRequirement, design: {} }),
      };
      const cases = [
        ['draft', results.fails],
        ['in_review', results.meets],
        ['approved', results.meets],
        ['returned', results.fails],
        ['draft-empty', null],
      ] as const;
      const ids: Record<string, number> = {};
      for (const [status, result] of cases) {
        const [dossier] = await db('dossier')
          .insert({ product_id: product.id, title: status, requirement: JSON.stringify(demoRequirement), created_by: userId, created_at: now })
          .returning('id');
        const [rev] = await db('revision')
          .insert({
            dossier_id: dossier.id,
            number: 1,
            status: 'draft',
            design: '{}',
            results: result ? JSON.stringify(result) : '{}',
            engine_version: '1.0.0',
            author_id: userId,
            created_at: now,
            updated_at: now,
          })
          .returning('id');
        if (status === 'in_review' || status === 'approved' || status === 'returned')
          await db('revision').where({ id: rev.id }).update({ status: 'in_review' });
        if (status === 'approved' || status === 'returned') await db('revision').where({ id: rev.id }).update({ status });
        ids[status] = rev.id;
      }

      await db.migrate.latest();

      const verdicts = Object.fromEntries((await db('revision').select('id', 'verdict')).map((r) => [r.id, r.verdict]));
      expect({
        draft: verdicts[ids.draft],
        in_review: verdicts[ids.in_review],
        approved: verdicts[ids.approved],
        returned: verdicts[ids.returned],
        'draft-empty': verdicts[ids['draft-empty']],
      }).toEqual({ draft: 'fails', in_review: 'meets', approved: 'meets', returned: 'fails', 'draft-empty': 'incomplete' });
      // The guard lifted for the backfill is back.
      await expect(db('revision').where({ id: ids.approved }).update({ notes: 'changed' })).rejects.toThrow(/frozen/);
    } finally {
      await db.destroy();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
