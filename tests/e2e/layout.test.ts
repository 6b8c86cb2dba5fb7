// Every screen at phone and wide size, as the roles that use it: the page never scrolls sideways, no
// input lies outside its card or the screen, and error messages wrap inside the screen. Screenshots of
// each go to tests/e2e/screenshots/layout-*.png for a person to look at.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DemoRole } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser, type WatchedPage } from './browser';
import { expectTidy, focusEach } from './layout-checks';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

// Each walk visits several screens and measures every element; on a loaded machine that takes minutes.
const WALK_MS = 240_000;

const sizes = [
  ['phone', PHONE],
  ['wide', WIDE],
] as const;

async function ids() {
  const db = browser.server.ctx.db;
  const byStatus = async (status: string) =>
    (await db('revision').where({ status }).orderBy('id').first('id', 'dossier_id')) as { id: number; dossier_id: number };
  return {
    draft: await byStatus('draft'),
    inReview: await byStatus('in_review'),
    approved: await byStatus('approved'),
    returned: await byStatus('returned'),
  };
}

async function signedIn(size: { width: number; height: number }, role: DemoRole): Promise<WatchedPage> {
  const p = await browser.page(size);
  await p.signIn(role);
  return p;
}

async function visit(p: WatchedPage, path: string, testID: string) {
  await p.page.goto(`${browser.server.url}${path}`);
  await p.page.getByTestId(testID).waitFor();
}

describe('layout of every screen', { timeout: WALK_MS }, () => {
  for (const [name, size] of sizes) {
    it(`signed out on a ${name}: sign-in, forgot password, set-password and cautions`, async () => {
      const p = await browser.page(size);
      await visit(p, '/sign-in', 'sign-in-screen');
      await expectTidy(p, `sign-in-${name}`, { inputs: true });
      await p.page.getByTestId('sign-in-submit').click();
      await p.page.getByTestId('sign-in-email-error').waitFor();
      await expectTidy(p, `sign-in-errors-${name}`, { errors: true });
      await focusEach(p, `sign-in-${name}`);
      await visit(p, '/forgot-password', 'forgot-password-screen');
      await expectTidy(p, `forgot-password-${name}`, { inputs: true });
      await p.page.getByTestId('forgot-password-submit').click();
      await p.page.getByTestId('forgot-password-email-error').waitFor();
      await expectTidy(p, `forgot-password-errors-${name}`, { inputs: true, errors: true });
      await visit(p, '/set-password', 'invite-invalid');
      await expectTidy(p, `set-password-${name}`, { errors: true });
      await visit(p, '/cautions', 'cautions-screen');
      await expectTidy(p, `cautions-${name}`);
      await p.close();
    });

    it(`as an engineer on a ${name}: overview, quick check with bad input, dossiers, new dossier, snubber sizing, account`, async () => {
      const p = await signedIn(size, 'engineer');
      await expectTidy(p, `overview-engineer-${name}`);

      await visit(p, '/quick-check', 'quick-check-screen');
      await expectTidy(p, `quick-check-${name}`, { inputs: true });
      // A long unreadable entry in a right-hand field: the message and its example must wrap.
      await p.page.getByTestId('design-bus-maxVoltage').fill('seven hundred and forty-seven volts or so');
      await p.page.getByTestId('design-capacitors-series').fill('two in series, maybe three');
      await p.page.getByTestId('design-bus-maxVoltage-error').waitFor();
      await p.page.getByTestId('design-bus-maxVoltage').scrollIntoViewIfNeeded();
      await expectTidy(p, `quick-check-errors-${name}`, { inputs: true, errors: true });
      await focusEach(p, `quick-check-${name}`);

      await visit(p, '/dossiers', 'dossiers-screen');
      await expectTidy(p, `dossiers-${name}`);

      await visit(p, '/dossiers/new', 'new-dossier-screen');
      await expectTidy(p, `new-dossier-${name}`, { inputs: true });
      await p.page.getByTestId('create-dossier').click();
      await p.page.getByTestId('new-dossier-errors').waitFor();
      await expectTidy(p, `new-dossier-errors-${name}`, { inputs: true, errors: true });
      await focusEach(p, `new-dossier-${name}`);

      await visit(p, '/snubber', 'snubber-screen');
      await expectTidy(p, `snubber-${name}`, { inputs: true });
      await p.page.getByTestId('sizing-f0').fill('20 MHz');
      await p.page.getByTestId('sizing-cAdd').fill('300 pF');
      await p.page.getByTestId('sizing-f1').fill('10 MHz');
      await p.page.getByTestId('result-cpar').waitFor();
      await expectTidy(p, `snubber-sized-${name}`, { inputs: true });
      await p.page.getByTestId('sizing-f1').fill('25 MHz');
      await p.page.getByTestId('sizing-f1-error').waitFor();
      await expectTidy(p, `snubber-f1-error-${name}`, { inputs: true, errors: true });

      await visit(p, '/account', 'account-screen');
      await expectTidy(p, `account-${name}`);
      // The deliberate refusals of this walk: f1 above f0 at the server.
      expect(p.problems.filter((x) => !/calc\/snubber|status of 400/.test(x))).toEqual([]);
      await p.close();
    });

    it(`as an engineer on a ${name}: every tab of a draft, a returned and an approved revision, and its dossier`, async () => {
      const { draft, returned, approved } = await ids();
      const p = await signedIn(size, 'engineer');
      await visit(p, `/dossiers/${draft.dossier_id}`, 'dossier-screen');
      await expectTidy(p, `dossier-engineer-${name}`);
      for (const [label, rev] of [
        ['draft', draft],
        ['returned', returned],
        ['approved', approved],
      ] as const) {
        await visit(p, `/revisions/${rev.id}`, 'design-tab');
        await expectTidy(p, `revision-${label}-design-${name}`, { inputs: label === 'draft' });
        for (const tab of ['evidence', 'changes', 'review'] as const) {
          await p.page.getByTestId(`revision-tabs-${tab}`).click();
          await p.page
            .locator(tab === 'changes' ? '[data-testid="changes"], [data-testid="changes-none"]' : `[data-testid="${tab}-tab"]`)
            .first()
            .waitFor();
          await expectTidy(p, `revision-${label}-${tab}-${name}`);
        }
      }
      await visit(p, `/revisions/${draft.id}`, 'design-tab');
      await focusEach(p, `revision-draft-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    });

    it(`as a reviewer on a ${name}: reviews, a revision to decide, the dossier with its audit trail`, async () => {
      const { inReview, approved } = await ids();
      const p = await signedIn(size, 'reviewer');
      await expectTidy(p, `overview-reviewer-${name}`);
      await visit(p, '/reviews', 'reviews-screen');
      await expectTidy(p, `reviews-${name}`);
      await visit(p, `/revisions/${inReview.id}?tab=review`, 'review-tab');
      await expectTidy(p, `revision-in-review-${name}`, { inputs: true });
      await p.page.getByTestId('return').click();
      await p.page.getByTestId('decision-comment-error').waitFor();
      await expectTidy(p, `revision-return-error-${name}`, { errors: true });
      await visit(p, `/dossiers/${approved.dossier_id}`, 'dossier-screen');
      await p.page.getByTestId('audit-verified').waitFor();
      await expectTidy(p, `dossier-reviewer-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    });

    it(`as a viewer on a ${name}: overview, dossiers and an approved revision`, async () => {
      const { approved } = await ids();
      const p = await signedIn(size, 'viewer');
      await expectTidy(p, `overview-viewer-${name}`);
      await visit(p, '/dossiers', 'dossiers-screen');
      await expectTidy(p, `dossiers-viewer-${name}`);
      await visit(p, `/revisions/${approved.id}`, 'design-tab');
      await expectTidy(p, `revision-viewer-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    });

    it(`as an admin on a ${name}: team and outbox`, async () => {
      const p = await signedIn(size, 'admin');
      await visit(p, '/team', 'team-screen');
      await expectTidy(p, `team-${name}`, { inputs: true });
      await p.page.getByTestId('invite-submit').click();
      await p.page.getByTestId('invite-email-error').waitFor();
      await expectTidy(p, `team-errors-${name}`, { inputs: true, errors: true });
      await focusEach(p, `team-${name}`);
      await visit(p, '/outbox', 'outbox-screen');
      await expectTidy(p, `outbox-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    });
  }
});
