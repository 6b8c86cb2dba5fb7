// Benchmark of the approved dossier export (issue 6 target: ≤ 1 s median to render and sign a
// ten-page dossier with three 2 000-point waveforms). Run: node --import tsx scripts/bench-pdf.ts
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadOrCreateSigningIdentity } from '../server/dossier-pdf/certificate';
import { renderDossierPdf } from '../server/dossier-pdf/render';
import { servoDriveDossier } from '../tests/pdf/fixture';

const RUNS = 10;
const WARM_UP = 2;

const dir = mkdtempSync(join(tmpdir(), 'vf-bench-pdf-'));
try {
  const identity = await loadOrCreateSigningIdentity({ dataDir: dir, production: false });
  const build = () => {
    const { model } = servoDriveDossier({ status: 'approved', full: true, tracePoints: 2000, signerSubject: identity.subject });
    model.signer.fingerprintSha256 = identity.fingerprintSha256;
    return model;
  };
  const waveforms = build().evidence.filter((e) => e.analysis).map((e) => e.analysis!.trace.length);

  let last: Buffer = Buffer.alloc(0);
  for (let i = 0; i < WARM_UP; i += 1) last = await renderDossierPdf(build(), { sign: { identity } });

  const times: number[] = [];
  for (let i = 0; i < RUNS; i += 1) {
    // A fresh model each run, as the server builds one per request.
    const model = build();
    const start = performance.now();
    last = await renderDossierPdf(model, { sign: { identity } });
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const median = (times[RUNS / 2 - 1] + times[RUNS / 2]) / 2;

  const file = join(dir, 'bench.pdf');
  writeFileSync(file, last);
  const pages = /^Pages:\s+(\d+)/m.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))?.[1] ?? '?';
  const signature = execFileSync('pdfsig', [file], { encoding: 'utf8' }).includes('Signature is Valid.') ? 'valid' : 'NOT VALID';

  console.log(`dossier: ${pages} pages, ${(last.length / 1024).toFixed(0)} KiB, ${waveforms.length} waveforms (${waveforms.join(', ')} points), signature ${signature}`);
  console.log(`render + sign, ${RUNS} runs after ${WARM_UP} warm-up: median ${median.toFixed(0)} ms, min ${times[0].toFixed(0)} ms, max ${times[RUNS - 1].toFixed(0)} ms`);
  console.log(`target ≤ 1000 ms median: ${median <= 1000 ? 'met' : 'NOT met'}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
