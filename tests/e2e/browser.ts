// Drives Debian's Chromium through playwright-core against the web export served by the real server.
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { DEMO_PASSWORD, demoEmail, startTestServer, type DemoRole, type TestServer } from '../support/test-server';

export const PHONE = { width: 390, height: 844 } as const;
export const WIDE = { width: 1280, height: 800 } as const;
export const SCREENSHOT_DIR = resolve('tests/e2e/screenshots');

export interface Browser {
  server: TestServer;
  /** A fresh page (own cookies) at the given size that records console errors and failed requests. */
  page(viewport: { width: number; height: number }): Promise<WatchedPage>;
  close(): Promise<void>;
}

export interface WatchedPage {
  page: Page;
  problems: string[];
  signIn(role: DemoRole): Promise<void>;
  shot(name: string): Promise<string>;
  close(): Promise<void>;
}

export async function openBrowser(): Promise<Browser> {
  // VOLTFALL_E2E_WEB_DIR lets a developer test an export built elsewhere; `npm test` builds dist/.
  const server = await startTestServer({ webDir: resolve(process.env.VOLTFALL_E2E_WEB_DIR ?? 'dist') });
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  // One browser process; each page gets its own context (its own cookies).
  const chrome = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  return {
    server,
    async page(viewport) {
      const ctx = await chrome.newContext({ viewport });
      const page = await ctx.newPage();
      page.setDefaultTimeout(20_000);
      const problems: string[] = [];
      page.on('console', (msg) => {
        if (msg.type() === 'error') problems.push(`console: ${msg.text()}`);
      });
      page.on('pageerror', (err) => problems.push(`page error: ${err.message}`));
      page.on('requestfailed', (req) => {
        // A request cut short by the test navigating away is not a failure of the app.
        if (req.failure()?.errorText !== 'net::ERR_ABORTED') problems.push(`request failed: ${req.url()} ${req.failure()?.errorText ?? ''}`);
      });
      page.on('response', (res) => {
        if (res.status() >= 400) problems.push(`HTTP ${res.status()}: ${res.url()}`);
      });
      return {
        page,
        problems,
        async signIn(role) {
          await page.goto(`${server.url}/sign-in`);
          await page.getByTestId('sign-in-email').fill(demoEmail(role));
          await page.getByTestId('sign-in-password').fill(DEMO_PASSWORD);
          await page.getByTestId('sign-in-submit').click();
          await page.getByTestId('overview-screen').waitFor();
        },
        async shot(name) {
          const file = join(SCREENSHOT_DIR, `${name}.png`);
          await page.screenshot({ path: file, fullPage: false });
          return file;
        },
        async close() {
          await ctx.close();
        },
      };
    },
    async close() {
      await chrome.close();
      await server.close();
    },
  };
}
