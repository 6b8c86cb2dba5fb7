// Account recovery through the real local SMTP server: invitations resent and revoked, password reset
// links; links expire (invitation 7 days, reset 1 hour) and die on use. Time moves on a fake clock.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, FakeClock, startTestServer, type TestServer } from '../support/test-server';

const HOUR = 3600_000;
const DAY = 24 * HOUR;
const STRONG = 'tangerine-orbit-kettle-41';

let server: TestServer;
const clock = new FakeClock();
beforeAll(async () => {
  server = await startTestServer({}, {}, { clock });
});
afterAll(() => server.close());

type Mail = { to: string; subject: string; text: string };
const tokenOf = (mail: Mail) => /set-password\?token=([\w-]+)/.exec(mail.text)![1];
const mailsTo = async (email: string) => {
  await server.ctx.background.settled();
  return (await server.ctx.db('mail_queue').where('to', email).orderBy('id')) as Mail[];
};
/** Waits for the n-th message to this address (1-based) and returns its link token. */
async function nthLink(email: string, n: number): Promise<string> {
  await server.ctx.background.settled();
  let mail: Mail | undefined;
  await expect
    .poll(
      async () => {
        await server.mail.flush();
        mail = ((await server.ctx.db('mail_outbox').where('to', 'like', `%${email}%`).orderBy('id')) as Mail[])[n - 1];
        return mail !== undefined;
      },
      { timeout: 10_000 },
    )
    .toBe(true);
  return tokenOf(mail!);
}

async function invite(email: string, name: string) {
  const admin = await server.signIn('admin');
  const res = await admin.post('/api/users').send({ email, name, role: 'engineer' });
  expect(res.status).toBe(201);
  return { admin, id: res.body.id as string, token: await nthLink(email, 1) };
}

const linkInfo = (token: string) => server.anonymous().get(`/api/auth/invite?token=${token}`);
const setPassword = (token: string, password: string) => server.anonymous().post('/api/auth/set-password').send({ token, password });

describe('invitations', () => {
  it('when an admin resends an invitation, then a fresh link arrives by mail, the old one is dead and the new one works once', async () => {
    const { admin, id, token: first } = await invite('resend@fennel.test', 'Rosa Ferreira');
    const resent = await admin.post(`/api/users/${id}/invite`);
    expect(resent.status).toBe(200);
    expect(resent.body).toMatchObject({ invitePending: true, invite: { status: 'open' } });
    const second = await nthLink('resend@fennel.test', 2);
    expect(second).not.toBe(first);

    const old = await linkInfo(first);
    expect(old.status).toBe(410);
    expect(old.body.error.message).toMatch(/withdrawn/);
    expect((await linkInfo(second)).body).toMatchObject({ email: 'resend@fennel.test', kind: 'invite' });
    expect((await setPassword(second, STRONG)).status).toBe(200);
    const again = await setPassword(second, `${STRONG}-2`);
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/already used/);
    expect((await server.anonymous().post('/api/auth/sign-in').send({ email: 'resend@fennel.test', password: STRONG })).status).toBe(200);

    // Once the password is chosen there is nothing to resend; the person uses "Forgot password?".
    const late = await admin.post(`/api/users/${id}/invite`);
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/Forgot password/);
  });

  it('when an admin revokes an invitation, then its link stops working, the Team list says so, and a resend makes a new one', async () => {
    const { admin, id, token } = await invite('revoke@fennel.test', 'Omar Siddiqui');
    const revoked = await admin.delete(`/api/users/${id}/invite`);
    expect(revoked.status).toBe(200);
    expect(revoked.body.invite.status).toBe('revoked');
    expect((await admin.get('/api/users')).body.find((u: { id: string }) => u.id === id).invite.status).toBe('revoked');
    expect((await setPassword(token, STRONG)).status).toBe(410);
    expect((await admin.delete(`/api/users/${id}/invite`)).status).toBe(409);

    expect((await admin.post(`/api/users/${id}/invite`)).status).toBe(200);
    const fresh = await nthLink('revoke@fennel.test', 2);
    expect((await setPassword(fresh, STRONG)).status).toBe(200);
  });

  it('when an invitation is 7 days old, then its link has expired', async () => {
    const { id, token } = await invite('slow@fennel.test', 'Lena Vogt');
    clock.advance(7 * DAY - 60_000);
    expect((await linkInfo(token)).status).toBe(200);
    clock.advance(120_000);
    const expired = await linkInfo(token);
    expect(expired.status).toBe(410);
    expect(expired.body.error.message).toMatch(/expired/);
    // The admin's earlier session ended long ago (12 h at most); a fresh one sees the state.
    const admin = await server.signIn('admin');
    expect((await admin.get('/api/users')).body.find((u: { id: string }) => u.id === id).invite.status).toBe('expired');
  });
});

describe('forgot password', () => {
  it('when anyone asks for a reset, then the answer is 202 with the same body whether the account exists, is unknown, disabled or only invited', async () => {
    const admin = await server.signIn('admin');
    const users = (await admin.get('/api/users')).body as Array<{ id: string; email: string }>;
    const disabled = users.find((u) => u.email === 'engineer2@fennel.test')!;
    await admin.patch(`/api/users/${disabled.id}`).send({ disabled: true });
    await admin.post('/api/users').send({ email: 'invited-only@fennel.test', name: 'Kai Ito', role: 'viewer' });

    const answers = [];
    for (const email of ['viewer@fennel.test', 'no-such-person@fennel.test', 'engineer2@fennel.test', 'invited-only@fennel.test']) {
      const res = await server.anonymous().post('/api/auth/forgot-password').send({ email });
      answers.push({ status: res.status, body: res.body });
    }
    expect(answers.every((a) => a.status === 202)).toBe(true);
    expect(new Set(answers.map((a) => JSON.stringify(a.body))).size).toBe(1);

    expect((await mailsTo('viewer@fennel.test')).map((m) => m.subject)).toEqual(['Reset your Voltfall password']);
    expect(await mailsTo('no-such-person@fennel.test')).toEqual([]);
    expect(await mailsTo('engineer2@fennel.test')).toEqual([]);
    expect((await mailsTo('invited-only@fennel.test')).map((m) => m.subject)).toEqual(['You have a Voltfall account at Fennel Grid Labs']);
    await admin.patch(`/api/users/${disabled.id}`).send({ disabled: false });
  });

  it('when the reset link is used, then the new password works, the old one and every session end, and the link is dead', async () => {
    const before = await server.signIn('reviewer');
    expect((await server.anonymous().post('/api/auth/forgot-password').send({ email: ' Reviewer@Fennel.test ' })).status).toBe(202);
    const token = await nthLink('reviewer@fennel.test', 1);
    expect((await linkInfo(token)).body).toMatchObject({ email: 'reviewer@fennel.test', name: 'Marta Kowalczyk', kind: 'reset' });

    const weak = await setPassword(token, 'MartaKowalczyk2024');
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields).toEqual([{ path: 'password', message: expect.stringMatching(/your name/) }]);

    expect((await setPassword(token, STRONG)).status).toBe(200);
    expect((await before.get('/api/auth/me')).status).toBe(401);
    expect((await server.anonymous().post('/api/auth/sign-in').send({ email: 'reviewer@fennel.test', password: DEMO_PASSWORD })).status).toBe(401);
    expect((await server.anonymous().post('/api/auth/sign-in').send({ email: 'reviewer@fennel.test', password: STRONG })).status).toBe(200);
    expect((await setPassword(token, `${STRONG}-again`)).status).toBe(410);
  });

  it('when a reset link is an hour old, or a newer one was sent, then it no longer works', async () => {
    await server.anonymous().post('/api/auth/forgot-password').send({ email: 'admin@fennel.test' });
    const first = await nthLink('admin@fennel.test', 1);
    clock.advance(HOUR + 1000);
    const expired = await linkInfo(first);
    expect(expired.status).toBe(410);
    expect(expired.body.error.message).toMatch(/expired/);

    await server.anonymous().post('/api/auth/forgot-password').send({ email: 'admin@fennel.test' });
    const second = await nthLink('admin@fennel.test', 2);
    await server.anonymous().post('/api/auth/forgot-password').send({ email: 'admin@fennel.test' });
    const third = await nthLink('admin@fennel.test', 3);
    expect((await linkInfo(second)).body.error.message).toMatch(/withdrawn/);
    expect((await linkInfo(third)).status).toBe(200);
  });

  it('when one account is asked for again and again, then after three links an hour the rest are dropped silently (still 202)', async () => {
    const email = 'engineer@fennel.test';
    for (let i = 0; i < 5; i++) expect((await server.anonymous().post('/api/auth/forgot-password').send({ email })).status).toBe(202);
    expect((await mailsTo(email)).length).toBe(3);
  });

  it('when one address asks too often, then it gets 429 with Retry-After', async () => {
    const limited = await startTestServer({}, { SIGN_IN_LIMIT_PER_15_MIN: '2' }, { clock: new FakeClock() });
    try {
      const answers = [];
      for (const email of ['a@fennel.test', 'b@fennel.test', 'c@fennel.test'])
        answers.push(await limited.anonymous().post('/api/auth/forgot-password').send({ email }));
      expect(answers.map((a) => a.status)).toEqual([202, 202, 429]);
      expect(answers[2].headers['retry-after']).toBe(String(15 * 60));
      expect(answers[2].body.error.message).toMatch(/Too many reset requests/);
    } finally {
      await limited.close();
    }
  });
});
