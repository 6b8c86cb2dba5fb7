import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

describe('sign-in', () => {
  it('when a demo user signs in, then /me names them and their role', async () => {
    const agent = await server.signIn('reviewer');
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ email: 'reviewer@fennel.test', role: 'reviewer' });
  });

  it('the start-up probe answers 200 either way: no user when signed out, the user (and the dev Outbox flag) when signed in', async () => {
    expect((await server.anonymous().get('/api/auth/session')).body).toEqual({ user: null });
    const agent = await server.signIn('admin');
    expect((await agent.get('/api/auth/session')).body.user).toMatchObject({ email: 'admin@fennel.test', role: 'admin', outbox: true });
  });

  it('when the session cookie is set, then it is HttpOnly and SameSite=Lax', async () => {
    const res = await server.anonymous().post('/api/auth/sign-in').send({ email: 'viewer@fennel.test', password: DEMO_PASSWORD });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/voltfall_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('when the password is wrong or the e-mail unknown, then both answer the same 401', async () => {
    const wrong = await server.anonymous().post('/api/auth/sign-in').send({ email: 'admin@fennel.test', password: 'not-the-password' });
    const unknown = await server.anonymous().post('/api/auth/sign-in').send({ email: 'nobody@fennel.test', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
  });

  it('when the body is not JSON, then 400 malformed_json', async () => {
    const res = await server.anonymous().post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
  });

  it('when the e-mail is missing, then 400 names the field', async () => {
    const res = await server.anonymous().post('/api/auth/sign-in').send({ password: 'x' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('email');
  });

  it('when a state-changing request comes from another origin, then it is refused', async () => {
    const agent = await server.signIn('admin');
    const res = await agent.post('/api/auth/sign-out').set('Origin', 'https://evil.example');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin_rejected');
  });

  it('when the Origin names this host with another scheme, then it is refused: https://host is not http://host', async () => {
    const agent = await server.signIn('admin');
    const other = server.url.replace('http://', 'https://');
    const res = await agent.post('/api/auth/sign-out').set('Origin', other);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin_rejected');
    expect((await agent.get('/api/auth/me')).status).toBe(200);
  });

  it('when a trusted proxy reports https, then the https origin is this site and plain http is refused', async () => {
    const proxied = await startTestServer({}, { TRUST_PROXY: 'loopback' });
    try {
      const host = new URL(proxied.url).host;
      const send = (origin: string) => proxied.anonymous().post('/api/auth/sign-in').set('Origin', origin).set('X-Forwarded-Proto', 'https').send({});
      expect((await send(`https://${host}`)).status).toBe(400);
      expect((await send(`http://${host}`)).status).toBe(403);
    } finally {
      await proxied.close();
    }
  });

  it('when VOLTFALL_PUBLIC_URL is set, then its origin is accepted', async () => {
    const published = await startTestServer({}, { VOLTFALL_PUBLIC_URL: 'https://voltfall.example.test' });
    try {
      const send = (origin: string) => published.anonymous().post('/api/auth/sign-in').set('Origin', origin).send({});
      expect((await send('https://voltfall.example.test')).status).toBe(400);
      expect((await send('http://voltfall.example.test')).status).toBe(403);
    } finally {
      await published.close();
    }
  });

  it('when a user signs out, then the session no longer works', async () => {
    const agent = await server.signIn('engineer');
    expect((await agent.post('/api/auth/sign-out')).status).toBe(200);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });
});

describe('sign-in rate limit', () => {
  it('when one address tries too often, then it gets a clear 429', async () => {
    const limited = await startTestServer({}, { SIGN_IN_LIMIT_PER_15_MIN: '3' });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 4; i++) {
        const res = await limited.anonymous().post('/api/auth/sign-in').send({ email: 'admin@fennel.test', password: 'wrong-password' });
        statuses.push(res.status);
        if (res.status === 429) expect(res.body.error.message).toMatch(/Too many sign-in attempts/);
      }
      expect(statuses).toEqual([401, 401, 401, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('team administration', () => {
  it('when an admin invites a user, then the invite e-mail carries a one-time link that sets the password', async () => {
    const admin = await server.signIn('admin');
    const invite = await admin.post('/api/users').send({ email: 'newcomer@fennel.test', name: 'Noor Haddad', role: 'engineer' });
    expect(invite.status).toBe(201);
    expect(invite.body).toMatchObject({ email: 'newcomer@fennel.test', role: 'engineer', invitePending: true });

    const mail = await server.waitForMail((m) => m.to.includes('newcomer@fennel.test'));
    expect(mail.subject).toMatch(/Voltfall account/);
    expect(mail.html).toContain('Choose your password');
    const token = /set-password\?token=([\w-]+)/.exec(mail.text)?.[1];
    expect(token).toBeTruthy();

    const anon = server.anonymous();
    expect((await anon.get(`/api/auth/invite?token=${token}`)).status).toBe(200);
    const weak = await anon.post('/api/auth/set-password').send({ token, password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields[0].path).toBe('password');
    expect((await anon.post('/api/auth/set-password').send({ token, password: 'a-long-enough-password' })).status).toBe(200);

    const reused = await anon.post('/api/auth/set-password').send({ token, password: 'another-long-password' });
    expect(reused.status).toBe(410);
    expect(reused.body.error.message).toMatch(/already used/);

    const signIn = await anon.post('/api/auth/sign-in').send({ email: 'newcomer@fennel.test', password: 'a-long-enough-password' });
    expect(signIn.status).toBe(200);
  });

  it('when an invite link has expired, then it is refused with a clear message', async () => {
    const admin = await server.signIn('admin');
    await admin.post('/api/users').send({ email: 'late@fennel.test', name: 'Late Comer', role: 'viewer' });
    const mail = await server.waitForMail((m) => m.to.includes('late@fennel.test'));
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    await server.ctx.db('invite').update({ expires_at: '2000-01-01T00:00:00.000Z' });
    const res = await server.anonymous().get(`/api/auth/invite?token=${token}`);
    expect(res.status).toBe(410);
    expect(res.body.error.message).toMatch(/expired/);
  });

  it('when an admin disables a user, then that user is signed out at once and cannot sign in', async () => {
    const viewer = await server.signIn('viewer');
    const admin = await server.signIn('admin');
    const users = (await admin.get('/api/users')).body as Array<{ id: string; email: string }>;
    const target = users.find((u) => u.email === 'viewer@fennel.test')!;
    expect((await admin.patch(`/api/users/${target.id}`).send({ disabled: true })).status).toBe(200);
    expect((await viewer.get('/api/auth/me')).status).toBe(401);
    const again = await server.anonymous().post('/api/auth/sign-in').send({ email: 'viewer@fennel.test', password: DEMO_PASSWORD });
    expect(again.status).toBe(401);
    await admin.patch(`/api/users/${target.id}`).send({ disabled: false });
  });

  it('when an admin changes a role, then the user has the new role', async () => {
    const admin = await server.signIn('admin');
    const users = (await admin.get('/api/users')).body as Array<{ id: string; email: string }>;
    const target = users.find((u) => u.email === 'engineer2@fennel.test')!;
    const res = await admin.patch(`/api/users/${target.id}`).send({ role: 'reviewer' });
    expect(res.body.role).toBe('reviewer');
    const bad = await admin.patch(`/api/users/${target.id}`).send({ role: 'overlord' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('role');
    await admin.patch(`/api/users/${target.id}`).send({ role: 'engineer' });
  });
});
