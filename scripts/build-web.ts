// Builds the web export into dist/ with Expo's CLI (offline, no telemetry).
import { spawnSync } from 'node:child_process';

export function buildWeb(outputDir = 'dist'): void {
  const result = spawnSync('npx', ['expo', 'export', '--platform', 'web', '--output-dir', outputDir], {
    stdio: ['ignore', 'ignore', 'inherit'],
    env: { ...process.env, EXPO_NO_TELEMETRY: '1', EXPO_OFFLINE: '1', CI: '1' },
  });
  if (result.status !== 0) throw new Error(`expo export failed (exit ${result.status})`);
}

if (import.meta.url === `file://${process.argv[1]}`) buildWeb(process.argv[2]);
