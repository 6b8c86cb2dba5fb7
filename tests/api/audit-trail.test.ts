// The dossier's audit trail as the app shows it: every event of a real story, in order, as a sentence
// naming the actor, the revision number and the file — no raw action codes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditSentence } from '../../shared/audit-sentences';
import { captureCsv } from '../support/captures';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('audit trail in words', () => {
  it('when a dossier goes through a return and a second revision, then each event reads as a sentence with actor, revision number and file name', async () => {
    const engineer = await server.signIn('engineer');
    const reviewer = await server.signIn('reviewer');
    const products = (await engineer.get('/api/products')).body;
    const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Audit words', requirement: demoRequirement }))
      .body;
    const first = dossier.revisions[0].id as number;
    expect((await saveDraft(engineer, first, { design: demoDesign, notes: 'First cut.' })).status).toBe(200);
    const upload = await engineer
      .post(`/api/revisions/${first}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(captureCsv(1.3)), 'bench-rev1.csv');
    expect(upload.status).toBe(201);
    await engineer.post(`/api/revisions/${first}/submit`).expect(200);
    await reviewer.post(`/api/revisions/${first}/comments`).send({ body: 'Which probe?' }).expect(201);
    await reviewer
      .post(`/api/revisions/${first}/decision`)
      .send({ decision: 'return', comment: 'Name the probe and its input resistance.' })
      .expect(200);
    const second = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: first }).expect(201)).body;
    const copied = second.evidence[0].id as number;
    await engineer.delete(`/api/evidence/${copied}`).expect(200);

    const audit = (await reviewer.get(`/api/audit?dossierId=${dossier.id}`).expect(200)).body;
    const revisions = (await reviewer.get(`/api/dossiers/${dossier.id}`)).body.revisions as Array<{ id: number; number: number }>;
    const numbers = new Map(revisions.map((r) => [r.id, r.number]));
    const sentences = (audit.events as Parameters<typeof auditSentence>[0][]).map((e) =>
      auditSentence(e, { revisionNumber: (id) => numbers.get(id) }),
    );

    expect(sentences).toEqual([
      'Jonas Lindqvist created the dossier “Audit words”.',
      'Jonas Lindqvist started revision 1.',
      'Jonas Lindqvist saved the inputs and notes of revision 1; the calculation meets every check.',
      'Jonas Lindqvist attached the scope capture “bench-rev1.csv” to revision 1.',
      'Jonas Lindqvist submitted revision 1 for review; the calculation meets every check.',
      'Marta Kowalczyk commented on revision 1: “Which probe?”',
      'Marta Kowalczyk returned revision 1 for changes: “Name the probe and its input resistance.”',
      'Jonas Lindqvist started revision 2 from revision 1.',
      'Jonas Lindqvist removed “bench-rev1.csv” from revision 2.',
    ]);
    // No sentence falls back to a code such as "revision.approved" or "evidence.add".
    for (const s of sentences) expect(s).not.toMatch(/\b[a-z]+\.[a-z_]+\b/);
  });

  it('when an action is not known to the wording, then it still reads as words and names the revision', () => {
    const sentence = auditSentence(
      { action: 'revision.signature_checked', actorName: null, subjectType: 'revision', subjectId: '7', payload: {} },
      { revisionNumber: (id) => (id === 7 ? 3 : undefined) },
    );
    expect(sentence).toBe('The system: revision signature checked, revision 3.');
  });

  it('when an admin changes an account, then the sentence names the person and what changed', () => {
    const names = { userName: (id: string) => (id === 'u1' ? 'Jonas Lindqvist' : undefined) };
    expect(
      auditSentence({ action: 'user.update', actorName: 'Ada Admin', subjectType: 'user', subjectId: 'u1', payload: { role: 'reviewer' } }, names),
    ).toBe('Ada Admin made Jonas Lindqvist reviewer.');
    expect(
      auditSentence({ action: 'user.update', actorName: 'Ada Admin', subjectType: 'user', subjectId: 'u1', payload: { disabled: true } }, names),
    ).toBe('Ada Admin disabled the account of Jonas Lindqvist.');
  });
});
