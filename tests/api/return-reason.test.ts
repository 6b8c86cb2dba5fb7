// The reviewer's reason for a return travels with the work: in the e-mail to the author, on the
// Overview ("Returned to you: …") and at the top of the revision that answers it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const REASON = 'Show the margin at the 85 °C corner with the second-source resistor.';

async function returnedRevision(title: string) {
  const engineer = await server.signIn('engineer');
  const reviewer = await server.signIn('reviewer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const first = dossier.revisions[0].id as number;
  await saveDraft(engineer, first, { design: demoDesign });
  await engineer.post(`/api/revisions/${first}/submit`).expect(200);
  await reviewer.post(`/api/revisions/${first}/decision`).send({ decision: 'return', comment: REASON }).expect(200);
  return { engineer, reviewer, dossier, first };
}

describe('the reason of a return', () => {
  it('when a reviewer returns a revision, then the e-mail to the author carries the reason in both parts', async () => {
    await returnedRevision('Reason by mail');
    const mail = await server.waitForMail((m) => m.to.includes('engineer@fennel.test') && m.subject.includes('Reason by mail'));
    expect(mail.subject).toMatch(/was returned/);
    expect(mail.text).toContain(REASON);
    expect(mail.html).toContain('Show the margin at the 85 °C corner with the second-source resistor.');
  });

  it('when the author opens the Overview, then the returned revision says why it was returned', async () => {
    const { engineer, first } = await returnedRevision('Reason on the overview');
    const overview = (await engineer.get('/api/overview').expect(200)).body;
    const item = overview.returnedToMe.items.find((r: { id: number }) => r.id === first);
    expect(item.returnNote).toMatchObject({ revisionId: first, number: 1, comment: REASON, reviewer: { name: 'Marta Kowalczyk' } });
  });

  it('when the author starts the next revision, then that draft names the return it answers, and the Overview keeps the reason beside the draft', async () => {
    const { engineer, dossier, first } = await returnedRevision('Reason on the next draft');
    const second = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: first }).expect(201)).body;

    const draft = (await engineer.get(`/api/revisions/${second.id}`).expect(200)).body;
    expect(draft.answersReturn).toMatchObject({ revisionId: first, number: 1, comment: REASON, reviewer: { name: 'Marta Kowalczyk' } });
    expect(Date.parse(draft.answersReturn.at)).not.toBeNaN();
    // The returned revision itself answers nothing.
    expect((await engineer.get(`/api/revisions/${first}`)).body.answersReturn).toBeNull();

    const overview = (await engineer.get('/api/overview')).body;
    expect(overview.returnedToMe.items.map((r: { id: number }) => r.id)).not.toContain(first);
    const mine = overview.myDrafts.items.find((r: { id: number }) => r.id === second.id);
    expect(mine.returnNote).toMatchObject({ number: 1, comment: REASON });
  });

  it('when the revision before was approved, then a new draft answers no return', async () => {
    const { engineer, reviewer, dossier, first } = await returnedRevision('No return after approval');
    const second = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: first })).body;
    await engineer.post(`/api/revisions/${second.id}/submit`).expect(200);
    await reviewer
      .post(`/api/revisions/${second.id}/decision`)
      .send({ decision: 'approve', comment: 'Margin shown.', password: DEMO_PASSWORD })
      .expect(200);
    const third = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({})).body;
    expect((await engineer.get(`/api/revisions/${third.id}`)).body.answersReturn).toBeNull();
    // The approved second revision still names the return it answered.
    expect((await engineer.get(`/api/revisions/${second.id}`)).body.answersReturn).toMatchObject({ number: 1, comment: REASON });
  });
});
