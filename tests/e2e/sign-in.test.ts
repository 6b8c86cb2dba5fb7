import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

// What each role may reach from the navigation (docs/ARCHITECTURE.md §3).
const expectedNav: Record<string, { shows: string[]; hides: string[] }> = {
  admin: { shows: ['overview', 'check', 'dossiers', 'reviews', 'team', 'outbox'], hides: [] },
  engineer: { shows: ['overview', 'check', 'dossiers'], hides: ['reviews', 'team', 'outbox'] },
  reviewer: { shows: ['overview', 'check', 'dossiers', 'reviews'], hides: ['team', 'outbox'] },
  viewer: { shows: ['overview', 'check', 'dossiers'], hides: ['reviews', 'team', 'outbox'] },
};

describe('signing in through the browser', () => {
  for (const [role, nav] of Object.entries(expectedNav)) {
    it(`when the ${role} signs in on a wide screen, then the side rail shows only what the role allows`, async () => {
      const p = await browser.page(WIDE);
      await p.signIn(role as 'admin');
      await p.page.getByTestId('side-rail').waitFor();
      for (const item of nav.shows) expect(await p.page.getByTestId(`nav-${item}`).count(), item).toBe(1);
      for (const item of nav.hides) expect(await p.page.getByTestId(`nav-${item}`).count(), item).toBe(0);
      await p.page.getByTestId('caution-line').waitFor();
      await p.shot(`sign-in-${role}-wide`);
      expect(p.problems).toEqual([]);
      await p.close();
    });

    it(`when the ${role} signs in on a phone, then the bottom bar shows and the rest sits under Account`, async () => {
      const p = await browser.page(PHONE);
      await p.signIn(role as 'admin');
      await p.page.getByTestId('bottom-nav').waitFor();
      expect(await p.page.getByTestId('side-rail').count()).toBe(0);
      await p.shot(`sign-in-${role}-phone`);
      await p.page.getByTestId('nav-account').click();
      await p.page.getByTestId('account-screen').waitFor();
      for (const item of nav.hides.filter((i) => i !== 'reviews')) expect(await p.page.getByTestId(`more-${item}`).count(), item).toBe(0);
      await p.shot(`account-${role}-phone`);
      expect(p.problems).toEqual([]);
      await p.close();
    });
  }

  it('when the password is wrong, then the form says so and stays on sign-in', async () => {
    const p = await browser.page(PHONE);
    await p.page.goto(`${browser.server.url}/sign-in`);
    await p.page.getByTestId('sign-in-email').fill('engineer@fennel.test');
    await p.page.getByTestId('sign-in-password').fill('wrong password');
    await p.page.getByTestId('sign-in-submit').click();
    await expect.poll(() => p.page.getByTestId('sign-in-error').textContent()).toMatch(/not correct/);
    await p.shot('sign-in-wrong-password-phone');
    expect(p.problems.filter((x) => !x.includes('401'))).toEqual([]);
    await p.close();
  });

  it('Forgot password? → e-mail → one-time link → a new password → sign in with it', async () => {
    const p = await browser.page(PHONE);
    await p.page.goto(`${browser.server.url}/sign-in`);
    await p.page.getByTestId('forgot-password-link').click();
    await p.page.getByTestId('forgot-password-screen').waitFor();
    await p.page.getByTestId('forgot-password-email').fill('engineer2@fennel.test');
    await p.shot('forgot-password-phone');
    await p.page.getByTestId('forgot-password-submit').click();
    await expect.poll(() => p.page.getByTestId('forgot-password-sent').textContent()).toMatch(/If an active account has this e-mail address/);
    await p.shot('forgot-password-sent-phone');

    await browser.server.ctx.background.settled();
    const mail = await browser.server.waitForMail((m) => m.to.includes('engineer2@fennel.test') && m.subject.includes('Reset'));
    const link = /(http:\/\/\S+\/set-password\?token=[\w-]+)/.exec(mail.text)![1].replace(/^http:\/\/localhost:\d+/, browser.server.url);
    await p.page.goto(link);
    await expect.poll(() => p.page.getByTestId('set-password-intro').textContent()).toMatch(/Choose a new password for engineer2@fennel.test/);
    // Too easy to guess: the server says why on the field.
    await p.page.getByTestId('set-password-new').fill('PriyaRaman2024');
    await p.page.getByTestId('set-password-repeat').fill('PriyaRaman2024');
    await p.page.getByTestId('set-password-submit').click();
    await expect.poll(() => p.page.getByTestId('set-password-new-error').textContent()).toMatch(/built from your name/);
    await p.shot('reset-weak-password-phone');
    await p.page.getByTestId('set-password-new').fill('lantern ferry maple nine');
    await p.page.getByTestId('set-password-repeat').fill('lantern ferry maple nine');
    await p.page.getByTestId('set-password-submit').click();
    await p.page.getByTestId('password-set').waitFor();

    await p.page.goto(`${browser.server.url}/sign-in`);
    await p.page.getByTestId('sign-in-email').fill('engineer2@fennel.test');
    await p.page.getByTestId('sign-in-password').fill('lantern ferry maple nine');
    await p.page.getByTestId('sign-in-submit').click();
    await p.page.getByTestId('overview-screen').waitFor();
    // The weak password's 400 is the expected answer.
    expect(p.problems.filter((x) => !x.includes('400'))).toEqual([]);
    await p.close();
  });

  it('when someone opens a deep link without signing in, then they land on sign-in; an unknown path shows the 404 screen', async () => {
    const p = await browser.page(WIDE);
    await p.page.goto(`${browser.server.url}/team`);
    await p.page.getByTestId('sign-in-screen').waitFor();
    await p.page.goto(`${browser.server.url}/no/such/page`);
    await p.page.getByTestId('not-found-screen').waitFor();
    await p.close();
  });

  it('when a user signs out, then the app returns to sign-in', async () => {
    const p = await browser.page(PHONE);
    await p.signIn('viewer');
    await p.page.getByTestId('nav-account').click();
    await p.page.getByTestId('sign-out').click();
    await p.page.getByTestId('sign-in-screen').waitFor();
    expect(p.problems).toEqual([]);
    await p.close();
  });

  it('the app renders with the shipped Inter font, not a fallback', async () => {
    const p = await browser.page(WIDE);
    await p.page.goto(`${browser.server.url}/sign-in`);
    await p.page.getByTestId('sign-in-screen').waitFor();
    const families = await p.page.evaluate(async () => {
      await document.fonts.ready;
      const loaded: string[] = [];
      document.fonts.forEach((f) => {
        if (f.status === 'loaded') loaded.push(f.family.replace(/"/g, ''));
      });
      return loaded;
    });
    expect(families).toContain('Inter_400Regular');
    await p.close();
  });
});
