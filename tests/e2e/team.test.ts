// An admin invites a colleague from the Team screen; the invitation arrives at the local mail server
// (seen on the Outbox screen); its link sets a password once; the newcomer signs in.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

describe('team administration in the browser', () => {
  it('invite → outbox → set-password link → sign in; the link cannot be used twice', async () => {
    const admin = await browser.page(WIDE);
    await admin.signIn('admin');
    await admin.page.getByTestId('nav-team').click();
    await admin.page.getByTestId('team-screen').waitFor();
    await admin.page.getByTestId('invite-name').fill('Noor Haddad');
    await admin.page.getByTestId('invite-email').fill('noor@fennel.test');
    await admin.page.getByTestId('invite-role-reviewer').click();
    await admin.page.getByTestId('invite-submit').click();
    await admin.page.getByTestId('invite-sent').waitFor();
    await admin.page.getByTestId('team-row-noor@fennel.test').waitFor();
    await admin.shot('team-invited-wide');

    const mail = await browser.server.waitForMail((m) => m.to.includes('noor@fennel.test'));
    await admin.page.getByTestId('nav-outbox').click();
    await expect.poll(() => admin.page.getByTestId('outbox-screen').textContent()).toContain('You have a Voltfall account');
    await admin.shot('outbox-wide');
    const link = /(http:\/\/\S+\/set-password\?token=[\w-]+)/.exec(mail.text)![1];

    const newcomer = await browser.page(PHONE);
    await newcomer.page.goto(link.replace(/^http:\/\/localhost:\d+/, browser.server.url));
    await newcomer.page.getByTestId('set-password-new').fill('correct horse battery');
    await newcomer.page.getByTestId('set-password-repeat').fill('correct horse battery');
    await newcomer.page.getByTestId('set-password-submit').click();
    await newcomer.page.getByTestId('password-set').waitFor();
    await newcomer.shot('set-password-done-phone');

    const again = await browser.page(PHONE);
    await again.page.goto(link.replace(/^http:\/\/localhost:\d+/, browser.server.url));
    await expect.poll(() => again.page.getByTestId('invite-invalid').textContent()).toMatch(/already used/);
    await again.shot('set-password-reused-phone');

    await newcomer.page.goto(`${browser.server.url}/sign-in`);
    await newcomer.page.getByTestId('sign-in-email').fill('noor@fennel.test');
    await newcomer.page.getByTestId('sign-in-password').fill('correct horse battery');
    await newcomer.page.getByTestId('sign-in-submit').click();
    await newcomer.page.getByTestId('overview-screen').waitFor();
    await newcomer.page.getByTestId('nav-reviews').waitFor();

    expect(admin.problems).toEqual([]);
    expect(newcomer.problems).toEqual([]);
    // The reused link's 410 is the expected answer; nothing else may go wrong on that page.
    expect(again.problems.filter((p) => !p.includes('410') && !p.includes('Gone'))).toEqual([]);
  });

  it('resend → confirm → a new link works and the old one is dead; revoke → confirm → its link stops working', async () => {
    const admin = await browser.page(PHONE);
    await admin.signIn('admin');
    const adminApi = await browser.server.signIn('admin');
    for (const [email, name] of [
      ['ines@fennel.test', 'Inês Moura'],
      ['tariq@fennel.test', 'Tariq Aziz'],
    ]) {
      expect((await adminApi.post('/api/users').send({ email, name, role: 'engineer' })).status).toBe(201);
    }
    const firstMail = await browser.server.waitForMail((m) => m.to.includes('ines@fennel.test'));
    const firstLink = /(http:\/\/\S+\/set-password\?token=[\w-]+)/.exec(firstMail.text)![1].replace(/^http:\/\/localhost:\d+/, browser.server.url);
    await admin.page.goto(`${browser.server.url}/team`);
    await admin.page.getByTestId('team-screen').waitFor();

    await admin.page.getByTestId('resend-ines@fennel.test').click();
    await admin.page.getByTestId('confirm-resend-ines@fennel.test').waitFor();
    await admin.shot('team-resend-confirm-phone');
    await admin.page.getByTestId('confirm-resend-yes-ines@fennel.test').click();
    await expect
      .poll(() => admin.page.getByTestId('invite-result-ines@fennel.test').textContent())
      .toMatch(/A new invitation went to ines@fennel.test/);
    await admin.page.getByTestId('invite-result-ines@fennel.test').scrollIntoViewIfNeeded();
    await admin.shot('team-resent-phone');
    const secondMail = await browser.server.waitForMail((m) => m.to.includes('ines@fennel.test') && !m.text.includes(firstLink.split('token=')[1]));
    const secondLink = /(http:\/\/\S+\/set-password\?token=[\w-]+)/.exec(secondMail.text)![1].replace(/^http:\/\/localhost:\d+/, browser.server.url);

    const invitee = await browser.page(PHONE);
    await invitee.page.goto(firstLink);
    await expect.poll(() => invitee.page.getByTestId('invite-invalid').textContent()).toMatch(/withdrawn/);
    await invitee.page.goto(secondLink);
    await invitee.page.getByTestId('set-password-new').waitFor();

    await admin.page.getByTestId('revoke-tariq@fennel.test').click();
    await admin.page.getByTestId('confirm-revoke-tariq@fennel.test').waitFor();
    await admin.page.getByTestId('confirm-revoke-yes-tariq@fennel.test').click();
    await expect.poll(() => admin.page.getByTestId('invite-result-tariq@fennel.test').textContent()).toMatch(/invitation is revoked/);
    await expect.poll(() => admin.page.getByTestId('invite-state-tariq@fennel.test').textContent()).toMatch(/Invitation revoked/);
    await admin.page.getByTestId('invite-result-tariq@fennel.test').scrollIntoViewIfNeeded();
    await admin.shot('team-revoked-phone');
    const tariqMail = await browser.server.waitForMail((m) => m.to.includes('tariq@fennel.test'));
    const tariqToken = /token=([\w-]+)/.exec(tariqMail.text)![1];
    expect((await browser.server.anonymous().get(`/api/auth/invite?token=${tariqToken}`)).status).toBe(410);

    expect(admin.problems).toEqual([]);
    expect(invitee.problems.filter((p) => !p.includes('410') && !p.includes('Gone'))).toEqual([]);
  });
});
