// Layout checks shared by the browser tests: nothing scrolls sideways, inputs and text stay inside their
// cards and the screen, error messages wrap.
import { expect } from 'vitest';
import type { Page } from 'playwright-core';
import type { WatchedPage } from './browser';

export interface LayoutReport {
  viewport: number;
  /** The widest of the document and of every scrolling container, as scrollWidth − clientWidth. */
  sideways: string[];
  /** Inputs, text areas and text whose box is not inside the card that holds them. */
  outsideCard: string[];
  /** Inputs, buttons and error messages whose box leaves the screen. */
  outsideScreen: string[];
  /** Error messages whose text runs past their own box (not wrapped). */
  unwrapped: string[];
  inputs: number;
  errors: number;
}

/** Measures the page as it is now; a half-pixel of rounding is allowed. */
export function measure(page: Page): Promise<LayoutReport> {
  return page.evaluate(() => {
    const slack = 0.5;
    const vw = document.documentElement.clientWidth;
    const name = (el: Element) => el.getAttribute('data-testid') ?? el.getAttribute('aria-label') ?? el.tagName.toLowerCase();
    const visible = (el: Element) => {
      const r = el.getBoundingClientRect();
      return r.width > 0 && r.height > 0 && getComputedStyle(el).visibility !== 'hidden';
    };
    const sideways: string[] = [];
    const docWidth = Math.max(document.documentElement.scrollWidth, document.body.scrollWidth);
    if (docWidth > vw + slack) sideways.push(`document ${docWidth} > ${vw}`);
    for (const el of Array.from(document.querySelectorAll('*'))) {
      const style = getComputedStyle(el);
      // A container that clips or scrolls sideways still shifts its content when a child is focused.
      if (!['auto', 'scroll', 'hidden'].includes(style.overflowX)) continue;
      if (el.scrollWidth > el.clientWidth + 1 && el.clientWidth > 0 && !el.closest('svg'))
        sideways.push(`${name(el)} ${el.scrollWidth} > ${el.clientWidth}`);
      if (el.scrollLeft > 0) sideways.push(`${name(el)} scrolled ${el.scrollLeft} px sideways`);
    }
    const outsideCard: string[] = [];
    const outsideScreen: string[] = [];
    const inputs = Array.from(document.querySelectorAll('input, textarea')).filter(visible);
    for (const input of inputs) {
      const r = input.getBoundingClientRect();
      if (r.left < -slack || r.right > vw + slack) outsideScreen.push(`${name(input)} spans ${Math.round(r.left)}–${Math.round(r.right)} of ${vw}`);
      const card = input.closest('[role="group"]');
      if (!card) continue;
      const c = card.getBoundingClientRect();
      if (r.left < c.left - slack || r.right > c.right + slack) {
        outsideCard.push(`${name(input)} spans ${Math.round(r.left)}–${Math.round(r.right)}, its card ${Math.round(c.left)}–${Math.round(c.right)}`);
      }
    }
    // Text is held by its card too, across and down: a card too short for its content lets it run over the next.
    for (const el of Array.from(document.querySelectorAll('[role="group"] [dir="auto"]')).filter(visible)) {
      const card = el.closest('[role="group"]')!;
      const r = el.getBoundingClientRect();
      const c = card.getBoundingClientRect();
      if (r.left < c.left - slack || r.right > c.right + slack || r.top < c.top - slack || r.bottom > c.bottom + slack) {
        outsideCard.push(
          `text “${(el.textContent ?? '').slice(0, 40)}” at ${Math.round(r.left)}–${Math.round(r.right)} × ${Math.round(r.top)}–${Math.round(r.bottom)}, its card ${Math.round(c.left)}–${Math.round(c.right)} × ${Math.round(c.top)}–${Math.round(c.bottom)}`,
        );
      }
    }
    for (const el of Array.from(document.querySelectorAll('[role="button"], button, a')).filter(visible)) {
      const r = el.getBoundingClientRect();
      if (r.left < -slack || r.right > vw + slack) outsideScreen.push(`${name(el)} spans ${Math.round(r.left)}–${Math.round(r.right)} of ${vw}`);
    }
    const unwrapped: string[] = [];
    const errors = Array.from(document.querySelectorAll('[data-testid$="-error"], [role="alert"]')).filter(visible);
    for (const el of errors) {
      const r = el.getBoundingClientRect();
      if (r.left < -slack || r.right > vw + slack) outsideScreen.push(`${name(el)} spans ${Math.round(r.left)}–${Math.round(r.right)} of ${vw}`);
      if (el.scrollWidth > el.clientWidth + 1) unwrapped.push(`${name(el)} text ${el.scrollWidth} wide in a box of ${el.clientWidth}`);
    }
    return { viewport: vw, sideways, outsideCard, outsideScreen, unwrapped, inputs: inputs.length, errors: errors.length };
  });
}

export async function expectTidy(p: WatchedPage, shot: string, expected: { inputs?: boolean; errors?: boolean } = {}) {
  // Fonts and the settled layout first: react-native-web sizes some boxes after the first paint.
  await p.page.evaluate(() => document.fonts.ready);
  await p.page.waitForTimeout(150);
  const report = await measure(p.page);
  await p.shot(`layout-${shot}`);
  expect({
    shot,
    sideways: report.sideways,
    outsideCard: report.outsideCard,
    outsideScreen: report.outsideScreen,
    unwrapped: report.unwrapped,
  }).toEqual({
    shot,
    sideways: [],
    outsideCard: [],
    outsideScreen: [],
    unwrapped: [],
  });
  // A screen expected to carry inputs or errors must show them, or the checks above proved nothing.
  if (expected.inputs) expect(report.inputs, `${shot}: inputs on the page`).toBeGreaterThan(0);
  if (expected.errors) expect(report.errors, `${shot}: error messages on the page`).toBeGreaterThan(0);
}

/** Whether the document or any element is scrolled sideways (cheap enough to ask after every focus). */
function shiftedSideways(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const shifted: string[] = [];
    if (window.scrollX !== 0) shifted.push(`window scrolled ${window.scrollX} px sideways`);
    for (const el of Array.from(document.querySelectorAll('*'))) {
      // A long value scrolls inside its own input to show the caret; that is the input's text, not the screen.
      if (el.scrollLeft > 0 && !el.closest('svg') && !el.matches('input, textarea'))
        shifted.push(`${el.getAttribute('data-testid') ?? el.tagName.toLowerCase()} scrolled ${el.scrollLeft} px sideways`);
    }
    return shifted;
  });
}

/** Focuses each input in turn (as a thumb would); none may shift the screen sideways. */
export async function focusEach(p: WatchedPage, shot: string, selector = 'input, textarea') {
  const fields = p.page.locator(selector);
  const count = await fields.count();
  for (let i = 0; i < count; i += 1) {
    const field = fields.nth(i);
    if (!(await field.isVisible())) continue;
    await field.focus();
    expect({ shot, field: i, sideways: await shiftedSideways(p.page) }).toEqual({ shot, field: i, sideways: [] });
  }
}
