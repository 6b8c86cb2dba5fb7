// The dossier PDF as an assessor receives it, checked with tools outside the project: poppler's pdfsig
// (against an NSS trust store made by certutil), pdftotext, pdfimages and pdftoppm, qpdf, sha256sum
// and OpenSSL (cms, ts, x509, crl).
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderDossierPdf } from '../../server/dossier-pdf/render';
import { pem } from '../../server/signing/asn1';
import { DEV_NAMES, loadOrCreateDevPki, type DevPki } from '../../server/signing/dev-pki';
import { developmentSetup, type SigningSetup } from '../../server/signing/identity';
import { startLocalTsa, type LocalTsa } from '../../server/signing/local-tsa';
import { computeDischarge } from '../../shared/engine/index';
import { REVIEWER, servoDriveDossier, type Fixture } from './fixture';
import { flat, pageCount, pdfsig, pdftext, qpdfCheck, renderPage } from './poppler';
import { nssDatabase, securityStore, signatureParts, timestampParts } from './signature-tools';

const run = promisify(execFile);

// docs/DOMAIN.md §6, copied here as the specification the PDF must carry.
const CAUTION_SENTENCES = [
  'Stored energy in DC-link capacitors can kill.',
  'Calculations here support, and never replace, measurement and the judgement of a qualified person.',
  'Verify absence of voltage with a rated meter before touching.',
  'Limits shown are the values the user entered; check them against the current edition of the applicable standard and local regulations, and defer to the certification body or licensed assessor.',
];
const MARK = 'NOT APPROVED — not for certification';
const DEV_LABEL = 'Development certificate — not for certification';
const RUNNING = 'Servo drive SD-400 (FGL-SD400-22) · DC-link discharge after mains disconnection · Revision 2';

const ARTEFACTS = join(process.cwd(), 'tests', '.tmp', 'pdf');
let work: string;
let pki: DevPki;
let tsa: LocalTsa;
let setup: SigningSetup;
let rootPem: string;
let nss: string;

beforeAll(async () => {
  mkdirSync(ARTEFACTS, { recursive: true });
  work = mkdtempSync(join(ARTEFACTS, 'run-'));
  pki = await loadOrCreateDevPki(join(work, 'data'));
  tsa = await startLocalTsa(async () => pki.tsa);
  setup = developmentSetup(pki, tsa.url);
  rootPem = join(work, 'dev-root.pem');
  writeFileSync(rootPem, pem('CERTIFICATE', pki.root.cert));
  nss = await nssDatabase(join(work, 'nss'), { 'Voltfall development root': rootPem });
});

afterAll(async () => {
  await tsa.close();
  rmSync(work, { recursive: true, force: true });
});

function approvedFixture(s: SigningSetup): Fixture {
  const fixture = servoDriveDossier({
    status: 'approved',
    signerKind: s.identity.kind,
    signerSubject: s.identity.subject,
    timestampAuthority: s.tsaUrl,
  });
  fixture.model.signer.fingerprintSha256 = s.identity.fingerprintSha256;
  return fixture;
}

describe('an approved revision', () => {
  let fixture: Fixture;
  let pdf: Buffer;
  let file: string;
  let pages: number;

  beforeAll(async () => {
    fixture = approvedFixture(setup);
    pdf = await renderDossierPdf(fixture.model, { sign: { setup } });
    file = join(ARTEFACTS, 'approved.pdf');
    writeFileSync(file, pdf);
    pages = await pageCount(file);
  });

  it('carries one PAdES signature that pdfsig finds valid, by a certificate chained to the published root', async () => {
    const out = await pdfsig(file, nss);
    expect(out.stdout).toContain('Signature is Valid.');
    expect(out.stdout).toContain('Certificate is Trusted.');
    expect(out.stdout).toContain('Signature Type: ETSI.CAdES.detached');
    expect(out.stdout).toContain('Signing Hash Algorithm: SHA-256');
    expect(out.stdout).toContain(`Signer Certificate Common Name: ${DEV_NAMES.signer}`);
    expect(out.stdout.match(/Signature #\d+:/g)).toHaveLength(1);
  });

  it('without the root in the trust store, pdfsig does not trust the certificate (the check can fail)', async () => {
    const out = await pdfsig(file, await nssDatabase(join(work, 'nss-empty'), {}));
    expect(out.stdout).toContain('Signature is Valid.');
    expect(out.stdout).not.toContain('Certificate is Trusted.');
  });

  it('signs the whole first revision of the file; the only later bytes are the security store update', () => {
    const { byteRange } = signatureParts(pdf);
    const [a, , c, d] = byteRange;
    expect(a).toBe(0);
    const signedEnd = c + d;
    expect(pdf.subarray(0, signedEnd).toString('latin1').trimEnd().endsWith('%%EOF')).toBe(true);
    const update = pdf.subarray(signedEnd).toString('latin1');
    expect(update).toContain('/Type /DSS');
    expect(update).toMatch(/\/Prev \d+/);
    // Only streams, the DSS and the catalog again: nothing that changes what the pages show.
    expect(update).not.toMatch(/\/Type \/Page\b|\/Contents|\/Annots/);
  });

  it('has signed attributes content-type, message-digest and signing-certificate-v2, no signing-time, and verifies with openssl cms', async () => {
    const { cms, signed } = signatureParts(pdf);
    const cmsFile = join(work, 'approved-cms.der');
    const signedFile = join(work, 'approved-signed-bytes.bin');
    writeFileSync(cmsFile, cms);
    writeFileSync(signedFile, signed);
    const { stdout: printed } = await run('openssl', ['cms', '-inform', 'DER', '-in', cmsFile, '-cmsout', '-print'], { maxBuffer: 1 << 24 });
    const signedAttrs = printed.slice(printed.indexOf('signedAttrs:'), printed.indexOf('signatureAlgorithm:', printed.indexOf('signedAttrs:')));
    expect(signedAttrs).toContain('contentType (1.2.840.113549.1.9.3)');
    expect(signedAttrs).toContain('messageDigest (1.2.840.113549.1.9.4)');
    expect(signedAttrs).toContain('id-smime-aa-signingCertificateV2 (1.2.840.113549.1.9.16.2.47)');
    expect(signedAttrs).not.toContain('signingTime');
    expect(printed).toContain('unsignedAttrs:');
    expect(printed).toContain('id-smime-aa-timeStampToken (1.2.840.113549.1.9.16.2.14)');

    const verify = await run('openssl', [
      'cms',
      '-verify',
      '-inform',
      'DER',
      '-in',
      cmsFile,
      '-binary',
      '-content',
      signedFile,
      '-CAfile',
      rootPem,
      '-purpose',
      'any',
      '-out',
      '/dev/null',
    ]);
    expect(verify.stderr).toContain('Verification successful');
  });

  it('carries an RFC 3161 token over the signature value that openssl ts verifies against the development root', async () => {
    const { cms } = signatureParts(pdf);
    const { signatureValue, tokenFile } = await timestampParts(cms, work);
    const digest = createHash('sha256').update(signatureValue).digest('hex');
    const { stdout } = await run('openssl', ['ts', '-verify', '-token_in', '-in', tokenFile, '-digest', digest, '-CAfile', rootPem]);
    expect(stdout).toContain('Verification: OK');
    // The same token does not verify for other data: the imprint is bound to this signature.
    const other = createHash('sha256').update('another signature').digest('hex');
    await expect(run('openssl', ['ts', '-verify', '-token_in', '-in', tokenFile, '-digest', other, '-CAfile', rootPem])).rejects.toThrow(
      /Verification: FAILED|message imprint mismatch/,
    );
  });

  it('holds the signer’s and the TSA’s chains and the root’s CRL in the document security store (B-LT)', async () => {
    const store = await securityStore(file, work);
    const subjects = await Promise.all(
      store.certs.map(async (f) => (await run('openssl', ['x509', '-inform', 'DER', '-in', f, '-noout', '-subject'])).stdout),
    );
    for (const name of Object.values(DEV_NAMES)) expect(subjects.join('')).toContain(name);
    expect(store.crls).toHaveLength(1);
    const crl = await run('openssl', ['crl', '-inform', 'DER', '-in', store.crls[0], '-CAfile', rootPem, '-noout']);
    expect(crl.stderr + crl.stdout).toContain('verify OK');
  });

  it('when one byte inside the signed range changes, pdfsig reports a digest mismatch', async () => {
    const [, firstLength, secondStart, secondLength] = signatureParts(pdf).byteRange;
    for (const offset of [Math.floor(firstLength / 2), secondStart + Math.floor(secondLength / 2)]) {
      const tampered = Buffer.from(pdf);
      tampered[offset] ^= 0x01;
      const tamperedFile = join(work, `tampered-${offset}.pdf`);
      writeFileSync(tamperedFile, tampered);
      const out = await pdfsig(tamperedFile, nss);
      expect(out.stdout).not.toContain('Signature is Valid.');
      expect(out.stdout).toContain('Digest Mismatch.');
    }
  });

  it('passes qpdf --check', async () => {
    const out = await qpdfCheck(file);
    expect(out.code, out.stderr).toBe(0);
    expect(out.stdout).toContain('No syntax or stream encoding errors found');
  });

  it('carries the cautions, every check with its word, every evidence hash and the reviewer', async () => {
    const text = flat(await pdftext(file));
    for (const sentence of CAUTION_SENTENCES) expect(text).toContain(sentence);

    const checks = fixture.model.revision.results.checks;
    expect(checks.length).toBeGreaterThanOrEqual(4);
    for (const check of checks) {
      const word = check.limit === null ? 'FOR INFORMATION' : check.pass ? 'PASS' : check.alternative ? 'NOT MET' : 'FAIL';
      expect(text).toContain(`${word} ${check.label}`);
    }
    // Stored energy has no limit in this requirement: information, never a pass.
    expect(checks.find((c) => c.id === 'stored-energy')?.limit).toBeNull();
    expect(text).toContain('FOR INFORMATION Stored energy');
    expect(text).not.toContain('PASS Stored energy');

    // Hashes recomputed from the files themselves by coreutils, not taken from the model.
    for (const { entry, bytes } of fixture.files) {
      const copy = join(work, entry.originalName);
      writeFileSync(copy, bytes);
      const { stdout } = await run('sha256sum', [copy]);
      expect(text).toContain(stdout.split(/\s+/)[0]);
    }
    expect(text).toContain(REVIEWER.name);
    expect(text).not.toContain(MARK);
  });

  it('prints labels and engineering units, not field paths, ids or raw markdown', async () => {
    const text = flat(await pdftext(file));
    expect(text).not.toMatch(/design\.[a-z]+\.[a-zA-Z]+/);
    expect(text).not.toContain('(discharge-time)');
    expect(text).not.toContain('(optional)');
    expect(text).toContain('Resistance per resistor 7.5 kΩ');
    expect(text).toContain('Capacitance per unit 220 µF');
    // The notes' markdown is typeset: the words are there, the markup is not.
    expect(text).toContain('Bleeder: 3 strings of 3 × 7.5 kΩ');
    const toc = flat(await pdftext(file, 2));
    const notesPage = flat(await pdftext(file, Number(/Engineer’s notes (\d+)/.exec(toc)![1])));
    expect(notesPage).toContain('Design Bleeder: 3 strings');
    expect(notesPage).not.toMatch(/\*\*|`|## /);
  });

  it('lists the sections in a table of contents with their pages', async () => {
    const toc = flat(await pdftext(file, 2));
    expect(toc).toContain('Contents');
    expect(toc).toMatch(/1 Requirement and design inputs \d+/);
    expect(toc).toMatch(/9 Signatures \d+/);
    // The page a heading is listed on is the page it is printed on.
    const checksPage = Number(/2 Checks (\d+)/.exec(toc)![1]);
    expect(flat(await pdftext(file, checksPage))).toContain('2 Checks');
    expect(flat(await pdftext(file, checksPage - 1))).not.toContain('2 Checks');
  });

  it('puts the caution line on the page of the checks', async () => {
    const toc = flat(await pdftext(file, 2));
    const checksPage = Number(/2 Checks (\d+)/.exec(toc)![1]);
    const page = flat(await pdftext(file, checksPage));
    expect(page).toContain('Stored energy in DC-link capacitors can kill.');
    expect(page).toContain('Discharge time');
  });

  it('lists the audit trail in full as sentences with the head hash of the chain', async () => {
    const text = flat(await pdftext(file));
    expect(text).toContain('8 Audit trail');
    for (const event of fixture.model.audit.events) expect(text).toContain(`${event.hash.slice(0, 12)}…`);
    expect(text).toContain('11 Mar 2025 12:00 UTC — Tomas Berglund submitted revision 2 for review');
    expect(text).toContain('7 Mar 2025 16:02 UTC — Ilse Marchetti returned revision 1');
    // The same sentences as the app's audit trail (shared/audit-sentences.ts): revision numbers, file names, actors.
    expect(text).toContain('Tomas Berglund started revision 2 from revision 1.');
    const upload = fixture.model.audit.events.find((e) => e.action === 'evidence.add')!;
    expect(text).toContain(`Tomas Berglund attached the file “${String(upload.payload.name)}” to revision 2.`);
    expect(text).toContain(fixture.model.audit.headHash!);
  });

  it('ends with the signature page: signer, role, meaning, time with zone, content hash, and the timestamp', async () => {
    const last = flat(await pdftext(file, pages));
    expect(last).toContain('9 Signatures');
    expect(last).toContain(`Signed by (printed name) ${REVIEWER.name}`);
    expect(last).toContain('Role reviewer');
    expect(last).toContain('approved as reviewer');
    expect(last).toContain('12 Mar 2025 11:30 UTC');
    expect(last).toContain(fixture.model.revision.contentHash);
    expect(last).toContain('RFC 3161 timestamp');
    expect(last).toContain(DEV_LABEL);
  });

  it('labels the development certificate on the cover', async () => {
    const cover = flat(await pdftext(file, 1));
    expect(cover).toContain(DEV_LABEL);
    expect(cover).toContain('Approved — digitally signed');
    expect(cover).toContain('IEC 61800-5-1 (edition and clause to be confirmed by the compliance engineer)');
  });

  it('has product, dossier, revision, status, page N of M, the UTC generation time and the caution line on every page', async () => {
    expect(pages).toBeGreaterThanOrEqual(8);
    for (let page = 1; page <= pages; page += 1) {
      const text = flat(await pdftext(file, page));
      expect(text).toContain(RUNNING);
      expect(text).toContain('Status: Approved');
      expect(text).toContain(`Page ${page} of ${pages}`);
      expect(text).toContain('generated 2025-03-12 11:30:05 UTC');
      // Results are on every page but the cover, so the caution line is too (the cover has them in full).
      if (page > 1) expect(text).toContain('Stored energy in DC-link capacitors can kill. Calculations support, never replace, measurement');
    }
  });

  it('draws the charts as vectors with each capture named in a legend, and renders the pages to PNG', async () => {
    // pdfimages lists every raster image; a vector-only dossier has none (two header lines).
    const { stdout: images } = await run('pdfimages', ['-list', file]);
    expect(images.trim().split('\n')).toHaveLength(2);
    const toc = flat(await pdftext(file, 2));
    const chartPage = Number(/4 Decay chart (\d+)/.exec(toc)![1]);
    const chartText = flat(await pdftext(file, chartPage));
    expect(chartText).toContain('Time after disconnection (s)');
    expect(chartText).toContain('Voltage (V)');
    expect(chartText).toContain('Worst case (calculated)');
    for (const name of ['pilot-unit-01-discharge.csv', 'pilot-unit-02-discharge.csv', 'pilot-unit-03-discharge.csv'])
      expect(chartText).toContain(`Measured: ${name}`);

    for (const [page, name] of [
      [1, 'approved-page-1'],
      [chartPage, 'approved-chart'],
    ] as const) {
      const prefix = join(ARTEFACTS, name);
      const out = await renderPage(file, page, prefix);
      expect(out.code, out.stderr).toBe(0);
      const png = readFileSync(`${prefix}.png`);
      expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
      expect(png.length).toBeGreaterThan(20_000);
    }
  });
});

describe('evidence checks named per capture (ids "measured-discharge:<12 hex>")', () => {
  it('prints each capture’s checks under its file name, and a check without a limit as for information', async () => {
    const { model } = servoDriveDossier({ status: 'draft' });
    const captures = model.evidence.filter((e) => e.analysis);
    // The engine names each capture's checks by the kind, ":", and the first 12 hex of the capture's sha256.
    for (const capture of captures) {
      const own = model.revision.results.checks.filter((c) => c.evidenceSha256 === capture.sha256);
      expect(own.map((c) => c.id)).toContain(`measured-discharge:${capture.sha256.slice(0, 12)}`);
    }
    model.revision.results.checks.push({
      id: 'single-fault-time',
      label: 'Worst single fault: one bleeder string open',
      value: 7.1,
      limit: null,
      unit: 's',
      pass: true,
      margin: null,
      detail: 'shown for information in this test',
    });
    const file = join(work, 'per-capture.pdf');
    writeFileSync(file, await renderDossierPdf(model));
    const text = flat(await pdftext(file));
    expect(text).toContain('Single-fault checks');
    expect(text).toContain('FOR INFORMATION Worst single fault: one bleeder string open');
    for (const capture of captures) {
      const at = text.indexOf(`${capture.originalName} SHA-256 ${capture.sha256.slice(0, 16)}…`);
      expect(at).toBeGreaterThan(0);
      expect(text.indexOf(`PASS Measured time to 60 V (${capture.originalName})`, at)).toBeGreaterThan(at);
    }
  });
});

describe('the engineer’s notes', () => {
  it('are typeset from markdown: headings, lists, bold, code and html leave no markup behind', async () => {
    const { model } = servoDriveDossier({ status: 'draft' });
    model.revision.notes = [
      '# Discharge path',
      'The **bleeder** is `R5/R6`, *two* strings.',
      '',
      '1. First step',
      '2. Second step with **emphasis**',
      '',
      '- a bullet',
      '',
      '```',
      'V(t) = V0 * exp(-t / tau)',
      '```',
      '',
      'Checked on <b>three</b> units.',
    ].join('\n');
    model.diff = null;
    const file = join(work, 'notes.pdf');
    writeFileSync(file, await renderDossierPdf(model));
    const toc = flat(await pdftext(file, 2));
    const page = flat(await pdftext(file, Number(/Engineer’s notes (\d+)/.exec(toc)![1])));
    expect(page).toContain('Discharge path The bleeder is R5/R6, two strings.');
    // Numbered: pdftotext -raw prints each marker after its item.
    expect(page).toMatch(/First step 1\. Second step with emphasis 2\./);
    expect(page).toContain('a bullet');
    expect(page).toContain('V(t) = V0 * exp(-t / tau)');
    expect(page).toContain('Checked on three units.');
    expect(page).not.toMatch(/\*\*|`|^# |<b>|<\/b>/);
  });
});

describe.each(['draft', 'in_review', 'returned'] as const)('a %s revision', (status) => {
  let file: string;
  let pages: number;

  beforeAll(async () => {
    const { model } = servoDriveDossier({ status });
    file = join(ARTEFACTS, `${status}.pdf`);
    writeFileSync(file, await renderDossierPdf(model));
    pages = await pageCount(file);
  });

  it('is unsigned', async () => {
    const out = await pdfsig(file);
    expect(`${out.stdout}${out.stderr}`).toContain('does not contain any signatures');
  });

  it(`is marked "${MARK}" in the header and by the watermark on every page`, async () => {
    expect(pages).toBeGreaterThanOrEqual(5);
    for (let page = 1; page <= pages; page += 1) {
      const raw = await pdftext(file, page);
      expect(flat(raw)).toContain(MARK);
      // The watermark is drawn after everything else on the page, one rotated glyph per text line.
      expect(raw.replace(/\s+/g, '').endsWith(MARK.replace(/\s+/g, ''))).toBe(true);
    }
  });

  it('passes qpdf --check and has no signature page', async () => {
    const out = await qpdfCheck(file);
    expect(out.code, out.stderr).toBe(0);
    expect(flat(await pdftext(file))).not.toContain('9 Signatures');
  });
});

describe('rendering refuses a dossier that would mislead', () => {
  it('does not sign an unapproved revision', async () => {
    const { model } = servoDriveDossier({ status: 'in_review' });
    await expect(renderDossierPdf(model, { sign: { setup } })).rejects.toThrow(/Only an approved revision is signed/);
  });

  it('does not produce an unsigned approved dossier', async () => {
    const { model } = approvedFixture(setup);
    await expect(renderDossierPdf(model)).rejects.toThrow(/always signed/);
  });

  it('does not sign when the approval covers other content than the revision', async () => {
    const { model } = approvedFixture(setup);
    model.revision.contentHash = 'f'.repeat(64);
    await expect(renderDossierPdf(model, { sign: { setup } })).rejects.toThrow(/refusing to sign/);
  });
});

describe('the development PKI', () => {
  it('is created once in the data folder and reused; OpenSSL validates its certificates and CRL against the root', async () => {
    const dataDir = join(work, 'pki-data');
    const first = await loadOrCreateDevPki(dataDir);
    const second = await loadOrCreateDevPki(dataDir);
    expect(Buffer.from(second.signer.cert).equals(Buffer.from(first.signer.cert))).toBe(true);

    const files: Record<string, string> = {};
    for (const name of ['root', 'signer', 'tsa'] as const) {
      files[name] = join(work, `pki-${name}.pem`);
      writeFileSync(files[name], pem('CERTIFICATE', first[name].cert));
    }
    const verified = await run('openssl', ['verify', '-CAfile', files.root, files.signer, files.tsa]);
    expect(verified.stdout).toContain(`${files.signer}: OK`);
    expect(verified.stdout).toContain(`${files.tsa}: OK`);
    const signer = (await run('openssl', ['x509', '-in', files.signer, '-noout', '-text'])).stdout;
    expect(signer).toContain('Digital Signature, Non Repudiation');
    expect(signer).toContain(DEV_NAMES.signer);
    const tsaText = (await run('openssl', ['x509', '-in', files.tsa, '-noout', '-text'])).stdout;
    expect(tsaText).toMatch(/X509v3 Extended Key Usage: critical\s+Time Stamping/);
    const root = (await run('openssl', ['x509', '-in', files.root, '-noout', '-text'])).stdout;
    expect(root).toMatch(/X509v3 Basic Constraints: critical\s+CA:TRUE/);
    const crlFile = join(work, 'pki-crl.der');
    writeFileSync(crlFile, first.crl);
    const crl = await run('openssl', ['crl', '-inform', 'DER', '-in', crlFile, '-CAfile', files.root, '-noout']);
    expect(crl.stderr + crl.stdout).toContain('verify OK');
  });
});

describe('the development PKI created by two processes at once', () => {
  it('ends with one root that both processes use', async () => {
    const dataDir = join(work, 'pki-race');
    const script = join(process.cwd(), 'tests', 'pdf', 'print-dev-root.ts');
    const both = await Promise.all([1, 2].map(() => run('node', ['--import', 'tsx', script, dataDir])));
    // The stored root, fingerprinted by OpenSSL.
    const rootFile = join(work, 'pki-race-root.pem');
    writeFileSync(rootFile, pem('CERTIFICATE', (await loadOrCreateDevPki(dataDir)).root.cert));
    const { stdout } = await run('openssl', ['x509', '-in', rootFile, '-noout', '-fingerprint', '-sha256']);
    const stored = stdout.trim().split('=')[1];
    expect(both.map((r) => r.stdout.trim())).toEqual([stored, stored]);
  });
});

describe('a first draft with missing inputs, no evidence and a broken audit chain', () => {
  it('still renders, and says what is missing (by label) and that the chain is broken', async () => {
    const { model } = servoDriveDossier({ status: 'draft' });
    const design = { bus: { nominalVoltage: 565, maxVoltage: 622 }, capacitors: { capacitance: 2.2e-4, series: 2, parallel: 2 } };
    model.revision.design = design;
    model.revision.results = computeDischarge({ requirement: model.dossier.requirement, design });
    model.evidence = [];
    model.diff = null;
    model.reviews = [];
    model.audit = { ...model.audit, verified: false, firstBroken: { id: 6, reason: 'its content no longer matches its hash' } };
    const file = join(work, 'incomplete.pdf');
    writeFileSync(file, await renderDossierPdf(model));

    expect((await qpdfCheck(file)).code).toBe(0);
    const text = flat(await pdftext(file));
    expect(model.revision.results.verdict).toBe('incomplete');
    expect(text).toContain('Incomplete');
    expect(model.revision.results.missing).toEqual([
      'design.capacitors.toleranceMinus',
      'design.capacitors.tolerancePlus',
      'design.bleeder',
      'design.ambient',
    ]);
    expect(text).toContain('Capacitor bank: Tolerance −');
    expect(text).toContain('Bleeder network (every field)');
    expect(text).toContain('No evidence is attached to this revision.');
    expect(text).toContain('BROKEN');
    expect(text).toContain('from event 6: its content no longer matches its hash');
    for (const sentence of CAUTION_SENTENCES) expect(text).toContain(sentence);
  });
});
