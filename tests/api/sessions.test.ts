// Session lifetimes as ASVS 3.3 asks for level 2: at most 12 hours absolute, an idle timeout (30 min by
// default), expired sessions swept, a cap of concurrent sessions per user. Time moves on a fake clock.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { sweepExpired } from '../../server/server';
import { DEMO_PASSWORD, FakeClock, startTestServer, type TestServer } from '../support/test-server';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

let server: TestServer;
const clock = new FakeClock();
beforeAll(async () => {
  server = await startTestServer({}, { SESSIONS_PER_USER: '3' }, { clock });
});
afterAll(() => server.close());

const sessionRows = (userEmail: string) =>
  server.ctx.db('session').join('user', 'user.id', 'session.user_id').where('user.email', userEmail).select('session.*');

describe('session lifetime', () => {
  it('when a user signs in, then the cookie lives as long as the absolute lifetime (Max-Age 12 h) and is HttpOnly, SameSite=Lax, path /', async () => {
    const res = await server.anonymous().post('/api/auth/sign-in').send({ email: 'viewer@fennel.test', password: DEMO_PASSWORD });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/Max-Age=43200/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).toMatch(/Path=\//);
  });

  it('when a session is used at least every 29 minutes, then it stays; after 31 idle minutes it has ended and the cookie is cleared', async () => {
    const agent = await server.signIn('engineer');
    for (let i = 0; i < 4; i++) {
      clock.advance(29 * MINUTE);
      expect((await agent.get('/api/auth/me')).status).toBe(200);
    }
    clock.advance(31 * MINUTE);
    const idle = await agent.get('/api/auth/me');
    expect(idle.status).toBe(401);
    expect(String(idle.headers['set-cookie'])).toMatch(/voltfall_session=;.*Max-Age=0/);
  });

  it('when a session is kept busy, then it still ends 12 hours after sign-in', async () => {
    const agent = await server.signIn('reviewer');
    for (let elapsed = 0; elapsed < 12 * HOUR - 20 * MINUTE; elapsed += 20 * MINUTE) {
      clock.advance(20 * MINUTE);
      expect((await agent.get('/api/auth/me')).status, `after ${(elapsed + 20 * MINUTE) / MINUTE} min`).toBe(200);
    }
    clock.advance(20 * MINUTE);
    expect((await agent.get('/api/auth/me')).status).toBe(401);
  });

  it('when the periodic sweep runs, then expired sessions are deleted from the database', async () => {
    await server.signIn('admin');
    await server.signIn('admin');
    expect((await sessionRows('admin@fennel.test')).length).toBe(2);
    clock.advance(31 * MINUTE);
    const live = await server.signIn('admin');
    await sweepExpired(server.ctx);
    expect((await sessionRows('admin@fennel.test')).length).toBe(1);
    expect((await live.get('/api/auth/me')).status).toBe(200);
  });

  it('when a user signs in a fourth time with a cap of three, then the oldest session ends and the others go on', async () => {
    const agents = [];
    for (let i = 0; i < 4; i++) {
      agents.push(await server.signIn('engineer2'));
      clock.advance(1000);
    }
    const statuses = await Promise.all(agents.map(async (a) => (await a.get('/api/auth/me')).status));
    expect(statuses).toEqual([401, 200, 200, 200]);
  });

  it('the session table keeps only the SHA-256 of the token the cookie carries', async () => {
    const res = await server.anonymous().post('/api/auth/sign-in').send({ email: 'viewer@fennel.test', password: DEMO_PASSWORD });
    const token = /voltfall_session=([^;]+)/.exec(String(res.headers['set-cookie']))![1];
    const ids = (await server.ctx.db('session').select('id')).map((r) => r.id as string);
    expect(ids).not.toContain(token);
    expect(ids).toContain(createHash('sha256').update(token).digest('hex'));
  });
});

describe('session settings', () => {
  it('when SESSION_IDLE_MINUTES is 5, then six idle minutes end the session', async () => {
    const short = new FakeClock();
    const other = await startTestServer({}, { SESSION_IDLE_MINUTES: '5' }, { clock: short });
    try {
      const agent = await other.signIn('viewer');
      short.advance(4 * MINUTE);
      expect((await agent.get('/api/auth/me')).status).toBe(200);
      short.advance(6 * MINUTE);
      expect((await agent.get('/api/auth/me')).status).toBe(401);
    } finally {
      await other.close();
    }
  });

  it('when the absolute lifetime is set above 12 hours, then start-up refuses it', () => {
    expect(() => loadConfig({ SESSION_ABSOLUTE_HOURS: '13' })).toThrow(/SESSION_ABSOLUTE_HOURS/);
    expect(loadConfig({ SESSION_ABSOLUTE_HOURS: '8' }).sessions.absoluteMs).toBe(8 * HOUR);
  });
});
