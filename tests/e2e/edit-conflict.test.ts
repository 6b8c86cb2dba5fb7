// Two pages on one draft at phone width (two tabs, or two people on one account): a save from the page
// that is behind is caught, its input is kept, the changes made elsewhere are shown field by field in
// units, and the user resolves it either way — nothing is overwritten without being seen.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign } from '../support/fixtures';
import { newDraft } from '../support/test-server';
import { openBrowser, PHONE, type Browser, type WatchedPage } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

const stored = async (id: number) => {
  const row = await browser.server.ctx.db('revision').where({ id }).first('version', 'design', 'notes');
  return { version: row.version as number, design: JSON.parse(row.design), notes: row.notes as string };
};

async function openDraft(p: WatchedPage, id: number) {
  await p.page.goto(`${browser.server.url}/revisions/${id}`);
  await p.page.getByTestId('design-tab').waitFor();
}

/** A fresh draft open on two phone-sized pages, each signed in as its author. */
async function twoPagesOn(title: string) {
  const { id } = await newDraft(browser.server, title, demoDesign);
  const a = await browser.page(PHONE);
  const b = await browser.page(PHONE);
  for (const p of [a, b]) {
    await p.signIn('engineer');
    await openDraft(p, id);
  }
  return { id, a, b };
}

async function saved(p: WatchedPage) {
  await expect.poll(() => p.page.getByTestId('save-state').textContent(), { timeout: 20_000 }).toMatch(/^Saved/);
}

/** The 409s these pages meet are the subject of the test; anything else the browser reports is a problem. */
const unexpected = (p: WatchedPage) => p.problems.filter((m) => !/HTTP 409: .*\/api\/revisions\/\d+$/.test(m) && !/status of 409/.test(m));

describe('two pages on one draft', () => {
  it('when the page that is behind saves, then the conflict is shown in units and keeping its changes merges them onto the stored version', async () => {
    const { id, a, b } = await twoPagesOn('Two pages, different inputs');

    await a.page.getByTestId('rev-bleeder-resistance').fill('68k');
    await saved(a);
    expect((await stored(id)).design.bleeder.resistance).toBe(68_000);

    // Page B still shows version 2 and changes another input.
    await b.page.getByTestId('rev-bleeder-powerRating').fill('5 W');
    await b.page.getByTestId('edit-conflict').waitFor({ timeout: 20_000 });
    await expect.poll(() => b.page.getByTestId('save-state').textContent()).toMatch(/changed elsewhere/);
    const change = b.page.getByTestId('conflict-change-bleeder.resistance');
    expect(await change.textContent()).toContain('Stored now: 100 kΩ → 68 kΩ');
    expect(await change.textContent()).toContain('You did not change this one');
    expect(await b.page.getByTestId('conflict-mine-bleeder.powerRating').textContent()).toContain('3 W → 5 W');
    // B's input is still on the page, and nothing of it reached the database.
    expect(await b.page.getByTestId('rev-bleeder-powerRating').inputValue()).toBe('5 W');
    expect((await stored(id)).design.bleeder).toMatchObject({ resistance: 68_000, powerRating: 3 });
    // Typing on while the conflict is open saves nothing either: autosave waits for the choice.
    await b.page.getByTestId('rev-bleeder-derating').fill('40 %');
    await new Promise((r) => setTimeout(r, 2_000));
    expect((await stored(id)).version).toBe(3);
    await b.page.getByTestId('edit-conflict').scrollIntoViewIfNeeded();
    await b.shot('edit-conflict-phone');

    await b.page.getByTestId('conflict-keep-mine').click();
    await saved(b);
    expect(await b.page.getByTestId('rev-bleeder-resistance').inputValue()).toBe('68 kΩ');
    const after = await stored(id);
    expect(after.design.bleeder).toMatchObject({ resistance: 68_000, powerRating: 5, derating: 0.4 });
    expect(after.version).toBe(4);
    expect(unexpected(a)).toEqual([]);
    expect(unexpected(b)).toEqual([]);
    await a.close();
    await b.close();
  });

  it('when both pages changed the notes, then the page behind can take the stored notes and carry on saving', async () => {
    const { id, a, b } = await twoPagesOn('Two pages, same notes');

    await a.page.getByTestId('rev-notes').fill('Bleeders checked at 85 °C (page A).');
    await saved(a);
    await b.page.getByTestId('rev-notes').fill('Typed on page B from an old copy.');
    await b.page.getByTestId('conflict-notes').waitFor({ timeout: 20_000 });
    const notes = await b.page.getByTestId('conflict-notes').textContent();
    expect(notes).toContain('Stored now: Bleeders checked at 85 °C (page A).');
    expect(notes).toContain('Yours: Typed on page B from an old copy.');
    expect((await stored(id)).notes).toBe('Bleeders checked at 85 °C (page A).');

    await b.page.getByTestId('conflict-take-stored').click();
    await expect.poll(() => b.page.getByTestId('rev-notes').inputValue()).toBe('Bleeders checked at 85 °C (page A).');
    expect(await b.page.getByTestId('edit-conflict').count()).toBe(0);
    // B goes on from the stored version: its next save lands on top of it.
    await b.page.getByTestId('rev-bleeder-tolerance').fill('0.5 %');
    await saved(b);
    const after = await stored(id);
    expect(after).toMatchObject({ notes: 'Bleeders checked at 85 °C (page A).', version: 4 });
    expect(after.design.bleeder.tolerance).toBe(0.005);
    expect(unexpected(a)).toEqual([]);
    expect(unexpected(b)).toEqual([]);
    await a.close();
    await b.close();
  });
});
