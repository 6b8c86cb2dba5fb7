// Secrets stay out of the log (ASVS 7.1.1/7.1.2): request lines carry method, route, status, time and
// user id only; pino's redact censors secret-named fields in anything else that is logged.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
const lines: string[] = [];
beforeAll(async () => {
  server = await startTestServer({}, { LOG_LEVEL: 'info' }, { logDestination: { write: (line: string) => void lines.push(line) } });
});
afterAll(() => server.close());

const logged = () => lines.join('');
const requestLines = () => lines.map((l) => JSON.parse(l) as Record<string, unknown>).filter((l) => l.msg === 'request');

describe('the request log', () => {
  it('when a user signs in and works, then neither the session token nor the password appears in the log', async () => {
    const agent = server.anonymous();
    const signIn = await agent.post('/api/auth/sign-in').send({ email: 'engineer@fennel.test', password: DEMO_PASSWORD });
    expect(signIn.status).toBe(200);
    const token = /voltfall_session=([^;]+)/.exec(String(signIn.headers['set-cookie']))![1];
    expect(token.length).toBeGreaterThan(30);
    expect((await agent.get('/api/auth/me')).status).toBe(200);
    expect((await agent.get('/api/dossiers')).status).toBe(200);
    // A wrong password and a body that is not JSON are logged as requests too, without their bodies.
    await server
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@fennel.test', password: `${DEMO_PASSWORD}-wrong` });
    await agent.post('/api/products').set('Content-Type', 'application/json').send(`{"name":"${DEMO_PASSWORD}"`);

    expect(logged()).not.toContain(token);
    expect(logged()).not.toContain(DEMO_PASSWORD);
    expect(logged().toLowerCase()).not.toContain('cookie');
  });

  it('when a one-time link is opened, then its token (in the query string) is not logged', async () => {
    const admin = await server.signIn('admin');
    await admin.post('/api/users').send({ email: 'logcheck@fennel.test', name: 'Ilse Brandt', role: 'viewer' });
    const mail = await server.waitForMail((m) => m.to.includes('logcheck@fennel.test'));
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    expect((await server.anonymous().get(`/api/auth/invite?token=${token}`)).status).toBe(200);
    expect((await server.anonymous().post('/api/auth/set-password').send({ token, password: 'tangerine-orbit-kettle-41' })).status).toBe(200);
    expect(logged()).not.toContain(token);
    expect(logged()).not.toContain('tangerine-orbit-kettle-41');
  });

  it('each request line has exactly method, route (the pattern), status, time and user id', async () => {
    const engineer = await server.signIn('engineer');
    const me = (await engineer.get('/api/auth/me')).body as { id: string };
    const dossier = (await engineer.get('/api/dossiers')).body.items[0] as { id: number };
    await engineer.get(`/api/dossiers/${dossier.id}?q=secret-looking-query`);
    const line = requestLines().find((l) => l.route === '/api/dossiers/:id' && l.userId === me.id);
    expect(line).toBeDefined();
    const { level, time, pid, hostname, msg, ...fields } = line!;
    expect({ level, msg, hasTime: typeof time === 'number', hasPid: typeof pid === 'number', hasHost: typeof hostname === 'string' }).toEqual({
      level: 30,
      msg: 'request',
      hasTime: true,
      hasPid: true,
      hasHost: true,
    });
    expect(Object.keys(fields).sort()).toEqual(['method', 'ms', 'route', 'status', 'userId']);
    expect(fields).toMatchObject({ method: 'GET', status: 200 });
    expect(logged()).not.toContain('secret-looking-query');
    // An anonymous request carries a null user id.
    expect(requestLines().some((l) => l.route === '/api/auth/sign-in' && l.userId === null && l.status === 401)).toBe(true);
  });

  it('when anything else logs an object with secret-named fields, then they are censored', () => {
    server.ctx.log.info(
      {
        req: { headers: { cookie: 'voltfall_session=abc123', authorization: 'Bearer xyz789', 'set-cookie': 'voltfall_session=def456' } },
        body: { password: 'hunter2-hunter2', newPassword: 'n3w-pa55', token: 'tok-1', nested: { resetToken: 'tok-2' } },
      },
      'probe',
    );
    const probe = JSON.parse(lines.at(-1)!) as { req: { headers: Record<string, string> }; body: Record<string, unknown> };
    expect(probe.req.headers).toEqual({ cookie: '[redacted]', authorization: '[redacted]', 'set-cookie': '[redacted]' });
    expect(probe.body).toEqual({ password: '[redacted]', newPassword: '[redacted]', token: '[redacted]', nested: { resetToken: '[redacted]' } });
  });
});
