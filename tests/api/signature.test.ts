// Approving is an electronic signature: the reviewer re-enters their password (wrong or missing → 401
// on the password field, counted by the sign-in throttle), and the decision record keeps the signer's
// name, role, the meaning of the signature and the time.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, FakeClock, saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
const clock = new FakeClock();
beforeAll(async () => {
  server = await startTestServer({}, {}, { clock });
});
afterAll(() => server.close());

async function submittedRevision(title: string): Promise<number> {
  const engineer = await server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const id = dossier.revisions[0].id as number;
  await saveDraft(engineer, id, { design: demoDesign });
  expect((await engineer.post(`/api/revisions/${id}/submit`)).status).toBe(200);
  return id;
}

const revisionState = async (id: number) => {
  const row = await server.ctx.db('revision').where({ id }).first('status');
  const decisions = await server.ctx.db('review_decision').where({ revision_id: id });
  const signed = await server.ctx.db('signed_dossier').where({ revision_id: id });
  return { status: row.status, decisions: decisions.length, signed: signed.length };
};

describe('approval as a signature', () => {
  it('when a reviewer approves without the password, then 401 asks for it on the password field and nothing changes', async () => {
    const id = await submittedRevision('Signature: missing password');
    const reviewer = await server.signIn('reviewer');
    const res = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', comment: 'Fine.' });
    expect(res.status).toBe(401);
    expect(res.body.error).toMatchObject({ code: 'signature_refused', fields: [{ path: 'password', message: 'Enter your password to sign.' }] });
    expect(await revisionState(id)).toEqual({ status: 'in_review', decisions: 0, signed: 0 });
    // The reviewer is still signed in: a refused signature is not a sign-out.
    expect((await reviewer.get('/api/auth/me')).status).toBe(200);
  });

  it('when the password is wrong, then 401 says so on the password field and nothing changes', async () => {
    const id = await submittedRevision('Signature: wrong password');
    const reviewer = await server.signIn('reviewer');
    const res = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', comment: 'Fine.', password: `${DEMO_PASSWORD}x` });
    expect(res.status).toBe(401);
    expect(res.body.error.fields).toEqual([{ path: 'password', message: 'The password is not correct.' }]);
    expect(await revisionState(id)).toEqual({ status: 'in_review', decisions: 0, signed: 0 });
  });

  it('when the right password signs, then the decision records the signer, role, meaning and time, in the API and the audit chain', async () => {
    const id = await submittedRevision('Signature: signed');
    const reviewer = await server.signIn('reviewer');
    const res = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', comment: 'Checked.', password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.decision).toMatchObject({
      signerName: 'Marta Kowalczyk',
      signerRole: 'reviewer',
      meaning: 'approved as reviewer',
      reviewer: { email: 'reviewer@fennel.test' },
    });
    expect(Date.parse(res.body.decision.at)).not.toBeNaN();
    expect(await revisionState(id)).toEqual({ status: 'approved', decisions: 1, signed: 1 });
    const row = await server.ctx.db('review_decision').where({ revision_id: id }).first();
    expect(row).toMatchObject({ signer_name: 'Marta Kowalczyk', signer_role: 'reviewer', meaning: 'approved as reviewer' });
    const audit = (await reviewer.get(`/api/audit?dossierId=${res.body.dossierId}`)).body;
    const event = audit.events.find((e: { action: string }) => e.action === 'revision.approved');
    expect(event.payload).toMatchObject({ signerName: 'Marta Kowalczyk', signerRole: 'reviewer', meaning: 'approved as reviewer' });
    expect(audit.verified).toBe(true);
    // The viewer reads the same signature record on the approved revision.
    const viewer = await server.signIn('viewer');
    expect((await viewer.get(`/api/revisions/${id}`)).body.decision).toMatchObject({
      signerName: 'Marta Kowalczyk',
      meaning: 'approved as reviewer',
    });
  });

  it('when a reviewer returns a revision, then no password is needed and the record says "returned for changes as reviewer"', async () => {
    const id = await submittedRevision('Signature: returned');
    const reviewer = await server.signIn('reviewer');
    const res = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'return', comment: 'Add the single-fault case.' });
    expect(res.status).toBe(200);
    expect(res.body.decision).toMatchObject({ signerName: 'Marta Kowalczyk', signerRole: 'reviewer', meaning: 'returned for changes as reviewer' });
  });

  it('when wrong signing passwords pile up, then the sign-in throttle holds the account: signing and signing in both wait', async () => {
    const id = await submittedRevision('Signature: throttled');
    const reviewer = await server.signIn('reviewer');
    // Five refusals open the wait (the sign-in above cleared the earlier ones).
    for (let i = 0; i < 5; i++)
      expect((await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', password: `guess-${i}` })).status).toBe(401);
    const held = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', password: DEMO_PASSWORD });
    expect(held.status).toBe(429);
    expect(held.body.error.message).toMatch(/Too many signing attempts/);
    expect(held.headers['retry-after']).toBe('60');
    expect((await server.anonymous().post('/api/auth/sign-in').send({ email: 'reviewer@fennel.test', password: DEMO_PASSWORD })).status).toBe(429);
    expect(await revisionState(id)).toEqual({ status: 'in_review', decisions: 0, signed: 0 });

    clock.advance(61_000);
    expect((await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', password: DEMO_PASSWORD })).status).toBe(200);
  });
});
