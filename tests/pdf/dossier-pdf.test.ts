// The dossier PDF as an assessor receives it, checked with tools outside the project: poppler's pdfsig,
// pdftotext, pdfimages and pdftoppm, qpdf, sha256sum and OpenSSL.
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadOrCreateSigningIdentity, type SigningIdentity } from '../../server/dossier-pdf/certificate';
import { computeDischarge } from '../../shared/engine/index';
import { renderDossierPdf } from '../../server/dossier-pdf/render';
import { REVIEWER, servoDriveDossier, type Fixture } from './fixture';
import { flat, pageCount, pdfsig, pdftext, qpdfCheck, renderPage } from './poppler';

const run = promisify(execFile);

// DESIGN.md §7, copied here as the specification the PDF must carry.
const CAUTION_SENTENCES = [
  'Stored energy in DC-link capacitors can kill.',
  'Calculations here support, and never replace, measurement and the judgement of a qualified person.',
  'Verify absence of voltage with a rated meter before touching.',
  'Limits shown are the values the user entered; check them against the current edition of the applicable standard and local regulations, and defer to the certification body or licensed assessor.',
];
const MARK = 'NOT APPROVED — not for certification';
const DEV_LABEL = 'Development certificate — not for certification';

const ARTEFACTS = join(process.cwd(), 'tests', '.tmp', 'pdf');
let work: string;
let devIdentity: SigningIdentity;

beforeAll(async () => {
  mkdirSync(ARTEFACTS, { recursive: true });
  work = mkdtempSync(join(ARTEFACTS, 'run-'));
  devIdentity = await loadOrCreateSigningIdentity({ dataDir: join(work, 'data'), production: false });
});

afterAll(() => {
  rmSync(work, { recursive: true, force: true });
});

function approvedFixture(identity: SigningIdentity): Fixture {
  const fixture = servoDriveDossier({ status: 'approved', signerKind: identity.kind, signerSubject: identity.subject });
  fixture.model.signer.fingerprintSha256 = identity.fingerprintSha256;
  return fixture;
}

/** "/ByteRange [a b c d]" of the (single) signature. */
function byteRange(pdf: Buffer): [number, number, number, number] {
  const match = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/.exec(pdf.toString('latin1'));
  if (!match) throw new Error('no /ByteRange in the PDF');
  return [Number(match[1]), Number(match[2]), Number(match[3]), Number(match[4])];
}

describe('an approved revision', () => {
  let fixture: Fixture;
  let pdf: Buffer;
  let file: string;
  let pages: number;

  beforeAll(async () => {
    fixture = approvedFixture(devIdentity);
    pdf = await renderDossierPdf(fixture.model, { sign: { identity: devIdentity } });
    file = join(ARTEFACTS, 'approved.pdf');
    writeFileSync(file, pdf);
    pages = await pageCount(file);
  });

  it('is signed over the whole document, and pdfsig finds the signature valid', async () => {
    const out = await pdfsig(file);
    expect(out.stdout).toContain('Signature is Valid.');
    expect(out.stdout).toContain('Total document signed');
    expect(out.stdout).toContain('Signing Hash Algorithm: SHA-256');
    expect(out.stdout).toContain('Signature Type: adbe.pkcs7.detached');
    expect(out.stdout).toContain('Signer Certificate Common Name: Voltfall development signing (not for certification)');
    expect(out.stdout.match(/Signature #\d+:/g)).toHaveLength(1);
  });

  it('when one byte inside the signed range changes, pdfsig reports a digest mismatch', async () => {
    const [, firstLength, secondStart, secondLength] = byteRange(pdf);
    for (const offset of [Math.floor(firstLength / 2), secondStart + Math.floor(secondLength / 2)]) {
      const tampered = Buffer.from(pdf);
      tampered[offset] ^= 0x01;
      const tamperedFile = join(work, `tampered-${offset}.pdf`);
      writeFileSync(tamperedFile, tampered);
      const out = await pdfsig(tamperedFile);
      expect(out.stdout).not.toContain('Signature is Valid.');
      expect(out.stdout).toContain('Digest Mismatch.');
    }
  });

  it('passes qpdf --check', async () => {
    const out = await qpdfCheck(file);
    expect(out.code, out.stderr).toBe(0);
    expect(out.stdout).toContain('No syntax or stream encoding errors found');
  });

  it('carries the cautions, every check with its verdict, every evidence hash and the reviewer', async () => {
    const text = flat(await pdftext(file));
    for (const sentence of CAUTION_SENTENCES) expect(text).toContain(sentence);

    const checks = fixture.model.revision.results.checks;
    expect(checks.length).toBeGreaterThanOrEqual(4);
    for (const check of checks) {
      const word = check.pass ? 'PASS' : check.alternative ? 'NOT MET' : 'FAIL';
      expect(text).toContain(`${word} ${check.label}`);
    }

    // Hashes recomputed from the files themselves by coreutils, not taken from the model.
    for (const { entry, bytes } of fixture.files) {
      const copy = join(work, entry.originalName);
      writeFileSync(copy, bytes);
      const { stdout } = await run('sha256sum', [copy]);
      const digest = stdout.split(/\s+/)[0];
      expect(digest).toMatch(/^[0-9a-f]{64}$/);
      expect(text).toContain(digest);
    }

    expect(text).toContain(REVIEWER.name);
    expect(text).not.toContain(MARK);
  });

  it('ends with a signature page that prints the approval: reviewer, time and content hash', async () => {
    const last = flat(await pdftext(file, pages));
    expect(last).toContain('Approval and digital signature');
    expect(last).toContain(`Approved by ${REVIEWER.name}`);
    expect(last).toContain('Approved at 2025-03-12 11:30:00 UTC');
    expect(last).toContain(fixture.model.revision.contentHash);
    expect(last).toContain(DEV_LABEL);
  });

  it('labels the development certificate on the cover', async () => {
    const cover = flat(await pdftext(file, 1));
    expect(cover).toContain(DEV_LABEL);
    expect(cover).toContain('Approved — digitally signed');
    expect(cover).toContain('IEC 61800-5-1 (edition and clause to be confirmed by the compliance engineer)');
    expect(cover).toContain('Revision 2');
  });

  it('has the running header and "Page i of n" on every page', async () => {
    expect(pages).toBeGreaterThanOrEqual(5);
    for (let page = 1; page <= pages; page += 1) {
      const text = flat(await pdftext(file, page));
      expect(text).toContain('Servo drive SD-400 (FGL-SD400-22) · DC-link discharge after mains disconnection · Revision 2');
      expect(text).toContain(`Page ${page} of ${pages}`);
    }
  });

  it('draws the decay chart as vectors with text axes, and renders page 1 and the chart page to PNG', async () => {
    // pdfimages lists every raster image; a vector-only dossier has none.
    const { stdout: images } = await run('pdfimages', ['-list', file]);
    expect(images.trim().split('\n')).toHaveLength(2);

    let chartPage = 0;
    for (let page = 1; page <= pages && !chartPage; page += 1) {
      if (flat(await pdftext(file, page)).includes('Time after disconnection (s)')) chartPage = page;
    }
    expect(chartPage).toBeGreaterThan(1);
    const chartText = flat(await pdftext(file, chartPage));
    expect(chartText).toContain('Voltage (V)');
    expect(chartText).toContain('Worst case (calculated)');
    expect(chartText).toContain('Measured: pilot-unit-01-discharge.csv');

    for (const [page, name] of [[1, 'approved-page-1'], [chartPage, 'approved-chart']] as const) {
      const prefix = join(ARTEFACTS, name);
      const out = await renderPage(file, page, prefix);
      expect(out.code, out.stderr).toBe(0);
      const png = readFileSync(`${prefix}.png`);
      expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
      expect(png.length).toBeGreaterThan(20_000);
    }
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
    expect(flat(await pdftext(file))).not.toContain('Approval and digital signature');
  });
});

describe('rendering refuses a dossier that would mislead', () => {
  it('does not sign an unapproved revision', async () => {
    const { model } = servoDriveDossier({ status: 'in_review' });
    await expect(renderDossierPdf(model, { sign: { identity: devIdentity } })).rejects.toThrow(/Only an approved revision is signed/);
  });

  it('does not produce an unsigned approved dossier', async () => {
    const { model } = approvedFixture(devIdentity);
    await expect(renderDossierPdf(model)).rejects.toThrow(/always signed/);
  });

  it('does not sign when the approval covers other content than the revision', async () => {
    const { model } = approvedFixture(devIdentity);
    model.revision.contentHash = 'f'.repeat(64);
    await expect(renderDossierPdf(model, { sign: { identity: devIdentity } })).rejects.toThrow(/refusing to sign/);
  });
});

describe('the signing identity', () => {
  it('outside production, creates one development certificate in the data directory and reuses it', async () => {
    const dataDir = join(work, 'identity-data');
    const first = await loadOrCreateSigningIdentity({ dataDir, production: false });
    const p12 = join(dataDir, 'dev-signing.p12');
    const written = statSync(p12).mtimeMs;
    const second = await loadOrCreateSigningIdentity({ dataDir, production: false });
    expect(second.fingerprintSha256).toBe(first.fingerprintSha256);
    expect(statSync(p12).mtimeMs).toBe(written);
    expect(first.kind).toBe('development');

    // OpenSSL reads the stored file with the identity's password and sees the labelled certificate.
    const pem = join(work, 'dev-cert.pem');
    await run('openssl', ['pkcs12', '-in', p12, '-nokeys', '-clcerts', '-passin', `pass:${first.password}`, '-out', pem]);
    const { stdout } = await run('openssl', ['x509', '-in', pem, '-noout', '-subject', '-fingerprint', '-sha256']);
    expect(stdout).toContain('Voltfall development signing (not for certification)');
    expect(stdout).toContain(`Fingerprint=${first.fingerprintSha256}`);
  });

  it('in production, refuses to start without the organisation PKCS#12 file and password', async () => {
    await expect(loadOrCreateSigningIdentity({ dataDir: work, production: true })).rejects.toThrow(/SIGNING_P12_PATH/);
    await expect(loadOrCreateSigningIdentity({ dataDir: work, production: true, p12Path: '/nonexistent.p12' })).rejects.toThrow(
      /SIGNING_P12_PASSWORD/,
    );
  });

  describe('with an organisation certificate made by OpenSSL', () => {
    let p12: string;

    beforeAll(async () => {
      const dir = join(work, 'org');
      mkdirSync(dir);
      const key = join(dir, 'key.pem');
      const cert = join(dir, 'cert.pem');
      p12 = join(dir, 'org.p12');
      await run('openssl', ['req', '-x509', '-newkey', 'rsa:2048', '-nodes', '-subj', '/CN=Fennel Grid Labs dossier signing/O=Fennel Grid Labs', '-keyout', key, '-out', cert, '-days', '30']);
      await run('openssl', ['pkcs12', '-export', '-inkey', key, '-in', cert, '-out', p12, '-passout', 'pass:org-secret']);
    });

    it('rejects a wrong password with a clear message', async () => {
      await expect(loadOrCreateSigningIdentity({ dataDir: work, production: true, p12Path: p12, p12Password: 'wrong' })).rejects.toThrow(
        /wrong password/,
      );
    });

    it('signs an approved dossier that pdfsig validates, without the development label', async () => {
      const identity = await loadOrCreateSigningIdentity({ dataDir: work, production: true, p12Path: p12, p12Password: 'org-secret' });
      expect(identity.kind).toBe('organisation');
      const { model } = approvedFixture(identity);
      const file = join(work, 'approved-org.pdf');
      writeFileSync(file, await renderDossierPdf(model, { sign: { identity } }));
      const out = await pdfsig(file);
      expect(out.stdout).toContain('Signer Certificate Common Name: Fennel Grid Labs dossier signing');
      expect(out.stdout).toContain('Signature is Valid.');
      expect(out.stdout).toContain('Total document signed');
      expect(flat(await pdftext(file))).not.toContain(DEV_LABEL);
    });
  });
});

describe('a first draft with missing inputs, no evidence and a broken audit chain', () => {
  it('still renders, and says what is missing and that the chain is broken', async () => {
    const { model } = servoDriveDossier({ status: 'draft' });
    const design = { bus: { nominalVoltage: 565, maxVoltage: 622 }, capacitors: { capacitance: 2.2e-4, series: 2, parallel: 2 } };
    model.revision.design = design;
    model.revision.results = computeDischarge({ requirement: model.dossier.requirement, design });
    model.evidence = [];
    model.diff = null;
    model.reviews = [];
    model.audit = { verified: false, events: 9, firstBroken: { id: 6, reason: 'its content no longer matches its hash' } };
    const file = join(work, 'incomplete.pdf');
    writeFileSync(file, await renderDossierPdf(model));

    expect((await qpdfCheck(file)).code).toBe(0);
    const text = flat(await pdftext(file));
    expect(model.revision.results.verdict).toBe('incomplete');
    expect(text).toContain('Incomplete');
    for (const path of model.revision.results.missing) expect(text).toContain(path);
    expect(text).toContain('No evidence is attached to this revision.');
    expect(text).toContain('BROKEN');
    expect(text).toContain('from event 6: its content no longer matches its hash');
    for (const sentence of CAUTION_SENTENCES) expect(text).toContain(sentence);
  });
});
