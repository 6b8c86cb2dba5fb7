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
});
