// `npm run bench`: runs every benchmark script in turn; each prints its own figures.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';

const benches = readdirSync('scripts')
  .filter((f) => /^bench-.+\.ts$/.test(f))
  .sort();
let failed = 0;
for (const file of benches) {
  console.log(`\n=== ${file} ===`);
  const r = spawnSync('node', ['--import', 'tsx', `scripts/${file}`], { stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
