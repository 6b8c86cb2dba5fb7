// Renders the Voltfall mark (assets/icon.svg) to the PNG sizes Expo wants, through Debian's Chromium.
import { readFileSync } from 'node:fs';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';

const svg = readFileSync('assets/icon.svg', 'utf8');
const targets: Array<[string, number]> = [
  ['assets/icon.png', 1024],
  ['assets/favicon.png', 64],
];

const context = await chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'vf-icon-')), {
  executablePath: '/usr/bin/chromium',
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'],
});
const page = await context.newPage();
for (const [file, size] of targets) {
  await page.setViewportSize({ width: size, height: size });
  await page.setContent(`<html><body style="margin:0">${svg.replace('<svg ', `<svg width="${size}" height="${size}" `)}</body></html>`);
  await page.screenshot({ path: file, omitBackground: true });
}
await context.close();
