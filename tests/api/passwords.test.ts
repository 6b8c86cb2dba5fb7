// Password strength at set-password and reset (ASVS 2.1.1, 2.1.7): at least 12 characters once the ends
// are trimmed and repeated spaces merged, not on common-password lists (zxcvbn's common-password
// dictionary, @zxcvbn-ts/language-common), not built from the person's name, e-mail or the product's
// name; the field error says why. The example passwords are common practice, not project numbers.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passwordProblem } from '../../server/auth/password-policy';
import { startTestServer, type TestServer } from '../support/test-server';

const owner = { name: 'Marta Kowalczyk', email: 'marta.k@fennel.test', organisation: 'Fennel Grid Labs' };

describe('the password policy', () => {
  const weak: Array<[password: string, why: RegExp]> = [
    ['short-one', /at least 12 characters/],
    ['   abc      def      ', /at least 12 characters/],
    ['password1234', /common passwords/],
    ['Password1234!', /common passwords/],
    ['iloveyou12345', /common passwords/],
    ['qwertyuiop12', /common passwords|keyboard/],
    ['aaaaaaaaaaaaaaa', /repeats/],
    ['MartaKowalczyk2024', /your name, your e-mail address or the product's name/],
    ['marta.k@fennel.test!', /your name, your e-mail address or the product's name/],
    ['Voltfall2024!!', /your name, your e-mail address or the product's name/],
    ['voltfall-demo', /your name, your e-mail address or the product's name/],
  ];
  for (const [password, why] of weak) {
    it(`refuses ${JSON.stringify(password)} and says why`, () => {
      expect(passwordProblem(password, owner)).toMatch(why);
    });
  }

  for (const password of [
    'tangerine-orbit-kettle-41',
    'correct horse battery',
    'Kq7#mW2p!xZ9',
    'sun-pebble-cinder-ox',
    'ferry lantern under nine maples',
  ]) {
    it(`accepts ${JSON.stringify(password)}`, () => {
      expect(passwordProblem(password, owner)).toBeNull();
    });
  }

  it("judges the same password by whose it is: another person's name in it is no weakness", () => {
    expect(passwordProblem('MartaKowalczyk2024', owner)).not.toBeNull();
    expect(passwordProblem('MartaKowalczyk2024', { ...owner, name: 'Jonas Lindqvist', email: 'jonas@fennel.test' })).toBeNull();
  });
});

describe('choosing a password through the API', () => {
  let server: TestServer;
  beforeAll(async () => {
    server = await startTestServer();
  });
  afterAll(() => server.close());

  it('when an invited person picks a weak password, then 400 names the field and why; a strong one is taken', async () => {
    const admin = await server.signIn('admin');
    await admin.post('/api/users').send({ email: 'noor.haddad@fennel.test', name: 'Noor Haddad', role: 'engineer' });
    const mail = await server.waitForMail((m) => m.to.includes('noor.haddad@fennel.test'));
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    const anon = server.anonymous();

    for (const [password, why] of [
      ['noorhaddad123456', /your name/],
      ['password123456', /common passwords/],
      ['x'.repeat(129), /at most 128/],
    ] as const) {
      const res = await anon.post('/api/auth/set-password').send({ token, password });
      expect(res.status, password).toBe(400);
      expect(res.body.error.fields).toEqual([{ path: 'password', message: expect.stringMatching(why) }]);
    }
    expect((await anon.get(`/api/auth/invite?token=${token}`)).status).toBe(200);
    expect((await anon.post('/api/auth/set-password').send({ token, password: 'sun-pebble-cinder-ox' })).status).toBe(200);
  });
});
