// Scope captures for browser tests, uploaded through the page's own file picker.
import type { Page } from 'playwright-core';

/** A capture V0·e^(−t/τ) after a 0.5 s pre-trigger plateau (common practice: the shape of a bleeder discharge). */
export function captureCsv(tau: number, v0 = 600): string {
  const rows = ['Time (s),CH1 (V)'];
  for (let i = 0; i < 3000; i++) {
    const t = -0.5 + i * 0.003;
    rows.push(`${t.toFixed(4)},${(t < 0 ? v0 : v0 * Math.exp(-t / tau)).toFixed(3)}`);
  }
  return rows.join('\n');
}

/** Chooses the file on the Evidence tab and waits for the measured-against-predicted chart. */
export async function uploadCapture(page: Page, name: string, tau: number) {
  const chooser = page.waitForEvent('filechooser');
  await page.getByTestId('choose-file').click();
  await (await chooser).setFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(captureCsv(tau)) });
  await page.getByTestId('evidence-overlay').waitFor({ timeout: 20_000 });
}
