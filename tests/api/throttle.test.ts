// Sign-in throttling (ASVS 2.2.1): keyed on the account as the schema normalises it (trimmed, lower
// case) and, separately, on the client address (a forwarded address counts only from a configured
// proxy); a growing delay with Retry-After; the same answers for unknown accounts; kept in the database.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { DEMO_PASSWORD, FakeClock, startTestServer, type TestServer } from '../support/test-server';

const MINUTE = 60_000;

let server: TestServer;
const clock = new FakeClock();
beforeAll(async () => {
  server = await startTestServer({}, {}, { clock });
});
afterAll(() => server.close());

const attempt = (s: TestServer, email: string, password: string, forwardedFor?: string) => {
  const req = s.anonymous().post('/api/auth/sign-in');
  if (forwardedFor) req.set('X-Forwarded-For', forwardedFor);
  return req.send({ email, password });
};

// Padded and case-varied spellings of one account; the schema trims and lower-cases them all alike.
const spellings = (email: string) => [
  email,
  ` ${email.toUpperCase()} `,
  `\t${email[0].toUpperCase()}${email.slice(1)}`,
  `${email}   `,
  email.replace('fennel', 'FENNEL'),
  `  ${email}`,
];

describe('sign-in throttle per account', () => {
  it('when five wrong passwords come in five spellings of one e-mail, then the sixth try waits (429, Retry-After) even with the right password', async () => {
    const statuses: number[] = [];
    for (const email of spellings('engineer@fennel.test').slice(0, 5)) statuses.push((await attempt(server, email, 'not-the-password')).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401]);
    const blocked = await attempt(server, spellings('engineer@fennel.test')[5], DEMO_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(blocked.headers['retry-after']).toBe('60');
    expect(blocked.body.error).toMatchObject({ code: 'too_many_attempts' });
    expect(blocked.body.error.message).toMatch(/Too many sign-in attempts\. Wait 1 minute/);
  });

  it('when the wait is over and the next try fails too, then the delay doubles; the right password after it clears the count', async () => {
    clock.advance(61_000);
    expect((await attempt(server, 'ENGINEER@fennel.test', 'still-wrong')).status).toBe(401);
    const longer = await attempt(server, 'engineer@fennel.test', DEMO_PASSWORD);
    expect(longer.status).toBe(429);
    expect(longer.headers['retry-after']).toBe('120');
    clock.advance(2 * MINUTE + 1000);
    expect((await attempt(server, ' engineer@fennel.test', DEMO_PASSWORD)).status).toBe(200);
    // Cleared: five fresh failures are allowed again before the wait.
    for (let i = 0; i < 5; i++) expect((await attempt(server, 'engineer@fennel.test', 'wrong-again')).status).toBe(401);
    expect((await attempt(server, 'engineer@fennel.test', 'wrong-again')).status).toBe(429);
  });

  it('when the account does not exist, then the answers are the same: five 401s with the same body, then the same 429', async () => {
    const known: Array<{ status: number; body: unknown; retry: unknown }> = [];
    const unknown: typeof known = [];
    for (const [email, into] of [
      ['reviewer@fennel.test', known],
      ['nobody-here@fennel.test', unknown],
    ] as const) {
      for (const spelling of spellings(email)) {
        const res = await attempt(server, spelling, 'not-the-password');
        into.push({ status: res.status, body: res.body, retry: res.headers['retry-after'] });
      }
    }
    expect(unknown).toEqual(known);
    expect(known.map((k) => k.status)).toEqual([401, 401, 401, 401, 401, 429]);
  });

  it('when twenty wrong guesses arrive at once, then exactly five are judged and the rest wait', async () => {
    const results = await Promise.all(
      Array.from({ length: 20 }, (_, i) => attempt(server, spellings('viewer@fennel.test')[i % 6], `parallel-guess-${i}`)),
    );
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 401)).toHaveLength(5);
    expect(statuses.filter((s) => s === 429)).toHaveLength(15);
  });

  it('when the server restarts on the same data, then the account still waits (the count is in the database)', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'vf-throttle-'));
    const restartClock = new FakeClock();
    try {
      const first = await startTestServer({}, { VOLTFALL_DATA_DIR: dataDir }, { clock: restartClock });
      for (let i = 0; i < 5; i++) await attempt(first, 'admin@fennel.test', 'wrong-before-restart');
      await first.close();
      const second = await startTestServer({}, { VOLTFALL_DATA_DIR: dataDir }, { clock: restartClock });
      try {
        expect((await attempt(second, 'admin@fennel.test', DEMO_PASSWORD)).status).toBe(429);
      } finally {
        await second.close();
      }
    } finally {
      rmSync(dataDir, { recursive: true, force: true });
    }
  });
});

describe('sign-in throttle per address', () => {
  it('when one client guesses across many accounts with a forged X-Forwarded-For each time, then its own address is counted and the fourth try waits', async () => {
    const limited = await startTestServer({}, { SIGN_IN_LIMIT_PER_15_MIN: '3' }, { clock: new FakeClock() });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 4; i++) statuses.push((await attempt(limited, `guess${i}@fennel.test`, 'wrong-password', `203.0.113.${i + 1}`)).status);
      expect(statuses).toEqual([401, 401, 401, 429]);
      const last = await attempt(limited, 'guess9@fennel.test', 'wrong-password', '198.51.100.7');
      expect(last.status).toBe(429);
      expect(Number(last.headers['retry-after'])).toBe(15 * 60);
    } finally {
      await limited.close();
    }
  });

  it('when TRUST_PROXY names the proxy (here loopback), then the forwarded address is the client and each gets its own bucket', async () => {
    const proxied = await startTestServer({}, { SIGN_IN_LIMIT_PER_15_MIN: '3', TRUST_PROXY: 'loopback' }, { clock: new FakeClock() });
    try {
      const distinct: number[] = [];
      for (let i = 0; i < 4; i++) distinct.push((await attempt(proxied, `guess${i}@fennel.test`, 'wrong-password', `203.0.113.${i + 1}`)).status);
      expect(distinct).toEqual([401, 401, 401, 401]);
      const same: number[] = [];
      for (let i = 0; i < 4; i++) same.push((await attempt(proxied, `other${i}@fennel.test`, 'wrong-password', '198.51.100.7')).status);
      expect(same).toEqual([401, 401, 401, 429]);
    } finally {
      await proxied.close();
    }
  });

  it('when TRUST_PROXY is "true", then start-up refuses it (it would believe any forwarded address)', () => {
    expect(() => loadConfig({ TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY/);
    expect(loadConfig({ TRUST_PROXY: '1' }).trustProxy).toBe(1);
    expect(loadConfig({}).trustProxy).toBe(false);
  });
});
