// A mail outage never loses a state change: the message waits in the queue and goes out on a retry.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeSmtp } from '../../server/mail/fake-smtp';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('mail outage', () => {
  it('when the mail server is down at submission, then the revision is still submitted and the e-mail is delivered on a later attempt', async () => {
    const engineer = await server.signIn('engineer');
    const products = (await engineer.get('/api/products')).body;
    const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Outage story', requirement: demoRequirement }))
      .body;
    const id = dossier.revisions[0].id;
    await saveDraft(engineer, id, { design: demoDesign });

    const port = server.fakeSmtp!.port;
    await server.fakeSmtp!.close();
    const submitted = await engineer.post(`/api/revisions/${id}/submit`);
    expect(submitted.status).toBe(200);
    expect(submitted.body.status).toBe('in_review');

    await server.mail.flush();
    const waiting = await server.ctx.db('mail_queue').where('subject', 'like', '%Outage story%').first();
    expect(waiting.status).toBe('pending');
    expect(waiting.attempts).toBeGreaterThanOrEqual(1);
    expect(waiting.last_error).toBeTruthy();
    const admin = await server.signIn('admin');
    const outbox = (await admin.get('/api/outbox')).body;
    expect(outbox.queued.map((q: { subject: string }) => q.subject)).toContain(waiting.subject);

    // The mail server comes back; the retry is due.
    const restarted = await startFakeSmtp(server.ctx.db, port);
    try {
      await server.ctx
        .db('mail_queue')
        .where({ id: waiting.id })
        .update({ next_attempt_at: new Date(0).toISOString() });
      const mail = await server.waitForMail((m) => m.subject.includes('Outage story'));
      expect(mail.to).toContain('reviewer@fennel.test');
      expect((await server.ctx.db('mail_queue').where({ id: waiting.id }).first()).status).toBe('sent');
    } finally {
      await restarted.close();
    }
  });
});
