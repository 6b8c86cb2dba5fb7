// `npm test`: lint (ESLint with the import boundaries, then Prettier), make sure the system tools the tests
// need are present (installing them when running as root, as CI does), build the web export the browser
// tests drive, then run every test.
import { execSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { buildWeb } from './build-web';

const TOOLS: Array<[string, string]> = [
  ['/usr/bin/chromium', 'chromium'],
  ['/usr/bin/pdfsig', 'poppler-utils'],
  ['/usr/bin/pdftotext', 'poppler-utils'],
  ['/usr/bin/pdftoppm', 'poppler-utils'],
  ['/usr/bin/qpdf', 'qpdf'],
  ['/usr/bin/ngspice', 'ngspice'],
  ['/usr/bin/openssl', 'openssl'],
  ['/usr/bin/pdfimages', 'poppler-utils'],
  // NSS's certutil builds the trust store that pdfsig validates signatures against.
  ['/usr/bin/certutil', 'libnss3-tools'],
  // PostgreSQL 15's server binaries: the PostgreSQL back end is tested against a real server.
  ['/usr/lib/postgresql/15/bin/initdb', 'postgresql'],
  ['/usr/lib/postgresql/15/bin/postgres', 'postgresql'],
];
const APT_LINE = 'apt-get update && apt-get install -y chromium poppler-utils qpdf ngspice openssl libnss3-tools postgresql';

console.log('Linting (npm run lint)…');
const lint = spawnSync('npm', ['run', 'lint'], { stdio: 'inherit' });
if (lint.status !== 0) {
  console.error('npm run lint failed: fix the lint and formatting problems above before the tests run.');
  process.exit(lint.status ?? 1);
}

const missing = () => TOOLS.filter(([path]) => !existsSync(path)).map(([, pkg]) => pkg);

if (missing().length) {
  if (process.getuid?.() === 0) {
    console.log(`Installing test tools: ${[...new Set(missing())].join(', ')}`);
    execSync(APT_LINE, { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  }
  if (missing().length) {
    console.error(`Missing test tools (${[...new Set(missing())].join(', ')}). Install them with:\n  sudo ${APT_LINE}`);
    process.exit(1);
  }
}

console.log('Building the web export for the browser tests…');
buildWeb();

const result = spawnSync('npx', ['vitest', 'run', ...process.argv.slice(2)], { stdio: 'inherit' });
if (result.status !== 0) process.exit(result.status ?? 1);

// The API suite again on PostgreSQL + S3 (tests/support/test-server.ts starts one PostgreSQL and one
// local S3 server per test file, a database and a bucket per test server). Left out of this pass, because
// they are about one back end by nature and already ran above:
const ONE_BACKEND_ONLY: Array<[string, string]> = [
  // SIGKILL in the middle of a SQLite write and the restart on the same file and folder.
  ['tests/api/kill-restart.test.ts', 'SQLite file and local evidence folder'],
  // A full or read-only local disk under the data folder.
  ['tests/api/storage-faults.test.ts', 'local data folder'],
  // The cluster's primary and workers on one SQLite file.
  ['tests/api/cluster.test.ts', 'SQLite file shared by workers'],
  // These start their own PostgreSQL and S3 servers whatever the back end.
  ['tests/api/two-instances.test.ts', 'PostgreSQL + S3 already'],
  ['tests/api/job-lease.test.ts', 'both back ends already'],
  ['tests/api/mail-claims.test.ts', 'both back ends already'],
];
if (process.argv.length <= 2) {
  console.log('API tests on PostgreSQL + S3 (VOLTFALL_TEST_BACKEND=pg-s3)…');
  for (const [file, why] of ONE_BACKEND_ONLY) console.log(`  not repeated on PostgreSQL + S3: ${file} (${why})`);
  const started = Date.now();
  const pgPass = spawnSync('npx', ['vitest', 'run', 'tests/api', ...ONE_BACKEND_ONLY.flatMap(([file]) => ['--exclude', file])], {
    stdio: 'inherit',
    env: { ...process.env, VOLTFALL_TEST_BACKEND: 'pg-s3' },
  });
  console.log(`PostgreSQL + S3 pass: ${((Date.now() - started) / 1000).toFixed(0)} s`);
  process.exit(pgPass.status ?? 1);
}
process.exit(0);
