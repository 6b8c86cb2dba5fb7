// Signing with an organisation's own identity, as production does: a CA and a signing certificate made
// by OpenSSL (not by Voltfall), the certificate's CRL published over HTTP at its distribution point,
// the chain given apart from the PKCS#12 file. Validated with pdfsig against an NSS store trusting
// that CA, and with OpenSSL.
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { renderDossierPdf } from '../../server/dossier-pdf/render';
import { organisationSetup } from '../../server/signing/identity';
import { startSigning } from '../../server/signing/service';
import { servoDriveDossier } from './fixture';
import { flat, pdfsig, pdftext, qpdfCheck } from './poppler';
import { nssDatabase, securityStore, signatureParts } from './signature-tools';

const run = promisify(execFile);
const ARTEFACTS = join(process.cwd(), 'tests', '.tmp', 'pdf');

let dir: string;
let crlServer: Server;
let crlRequests = 0;
const files = { caKey: '', ca: '', signerKey: '', signer: '', p12: '', crl: '' };

beforeAll(async () => {
  dir = mkdtempSync(join(ARTEFACTS, 'org-'));
  const path = (name: string) => join(dir, name);
  Object.assign(files, {
    caKey: path('ca.key'),
    ca: path('ca.pem'),
    signerKey: path('signer.key'),
    signer: path('signer.pem'),
    p12: path('org.p12'),
    crl: path('root.crl'),
  });
  crlServer = createServer((_req, res) => {
    crlRequests += 1;
    res.writeHead(200, { 'Content-Type': 'application/pkix-crl' }).end(readFileSync(files.crl));
  });
  await new Promise<void>((resolve) => crlServer.listen(0, '127.0.0.1', resolve));
  const crlUrl = `http://127.0.0.1:${(crlServer.address() as AddressInfo).port}/root.crl`;

  await run('openssl', [
    'req',
    '-x509',
    '-newkey',
    'rsa:2048',
    '-nodes',
    '-keyout',
    files.caKey,
    '-out',
    files.ca,
    '-days',
    '30',
    '-subj',
    '/O=Fennel Grid Labs/CN=Fennel Grid Labs test root',
    '-addext',
    'basicConstraints=critical,CA:TRUE',
    '-addext',
    'keyUsage=critical,keyCertSign,cRLSign',
  ]);
  await run('openssl', [
    'req',
    '-newkey',
    'rsa:2048',
    '-nodes',
    '-keyout',
    files.signerKey,
    '-out',
    path('signer.csr'),
    '-subj',
    '/O=Fennel Grid Labs/CN=Fennel Grid Labs dossier signing',
  ]);
  writeFileSync(
    path('ext.cnf'),
    `[v3]\nbasicConstraints=critical,CA:FALSE\nkeyUsage=critical,digitalSignature,nonRepudiation\ncrlDistributionPoints=URI:${crlUrl}\nsubjectKeyIdentifier=hash\nauthorityKeyIdentifier=keyid\n`,
  );
  await run('openssl', [
    'x509',
    '-req',
    '-in',
    path('signer.csr'),
    '-CA',
    files.ca,
    '-CAkey',
    files.caKey,
    '-CAcreateserial',
    '-out',
    files.signer,
    '-days',
    '30',
    '-extfile',
    path('ext.cnf'),
    '-extensions',
    'v3',
  ]);
  writeFileSync(path('index.txt'), '');
  writeFileSync(path('crlnumber'), '01\n');
  writeFileSync(
    path('ca.cnf'),
    `[ca]\ndefault_ca=own\n[own]\ndatabase=${path('index.txt')}\ncrlnumber=${path('crlnumber')}\ndefault_md=sha256\ndefault_crl_days=30\n`,
  );
  await run('openssl', ['ca', '-config', path('ca.cnf'), '-gencrl', '-keyfile', files.caKey, '-cert', files.ca, '-out', path('root.crl.pem')]);
  await run('openssl', ['crl', '-in', path('root.crl.pem'), '-outform', 'DER', '-out', files.crl]);
  // The PKCS#12 holds the key and its certificate only; the CA comes in the chain file.
  await run('openssl', ['pkcs12', '-export', '-inkey', files.signerKey, '-in', files.signer, '-out', files.p12, '-passout', 'pass:org-secret']);
});

afterAll(async () => {
  await new Promise<void>((resolve) => crlServer.close(() => resolve()));
  rmSync(dir, { recursive: true, force: true });
});

describe('an organisation identity from a PKCS#12 file and its chain', () => {
  it('signs a dossier that pdfsig trusts through the organisation root, with the CRL fetched from the distribution point in its security store', async () => {
    const setup = await organisationSetup({ p12Path: files.p12, p12Password: 'org-secret', chainPath: files.ca, tsaUrl: null });
    expect(setup.identity.kind).toBe('organisation');
    const { model } = servoDriveDossier({
      status: 'approved',
      signerKind: 'organisation',
      signerSubject: setup.identity.subject,
      timestampAuthority: null,
    });
    const file = join(dir, 'approved-org.pdf');
    const before = crlRequests;
    const pdf = await renderDossierPdf(model, { sign: { setup } });
    writeFileSync(file, pdf);
    expect(crlRequests).toBeGreaterThan(before);

    const nss = await nssDatabase(join(dir, 'nss'), { 'Fennel Grid Labs test root': files.ca });
    const sig = await pdfsig(file, nss);
    expect(sig.stdout).toContain('Signer Certificate Common Name: Fennel Grid Labs dossier signing');
    expect(sig.stdout).toContain('Signature is Valid.');
    expect(sig.stdout).toContain('Certificate is Trusted.');
    expect(sig.stdout).toContain('Signature Type: ETSI.CAdES.detached');
    expect((await qpdfCheck(file)).code).toBe(0);

    const store = await securityStore(file, dir);
    expect(store.crls).toHaveLength(1);
    expect(readFileSync(store.crls[0]).equals(readFileSync(files.crl))).toBe(true);

    // TSA_URL=none: no timestamp attribute, and the dossier says it has no trusted time.
    const cmsFile = join(dir, 'org-cms.der');
    writeFileSync(cmsFile, signatureParts(pdf).cms);
    const { stdout } = await run('openssl', ['cms', '-inform', 'DER', '-in', cmsFile, '-cmsout', '-print'], { maxBuffer: 1 << 24 });
    expect(stdout).not.toContain('timeStampToken');
    const text = flat(await pdftext(file));
    expect(text).toContain('The signature carries no trusted timestamp (TSA_URL=none)');
    expect(text).not.toContain('Development certificate — not for certification');
  });

  it('refuses a wrong password, and a chain that does not reach a root, at start-up', async () => {
    await expect(organisationSetup({ p12Path: files.p12, p12Password: 'wrong', chainPath: files.ca, tsaUrl: null })).rejects.toThrow(
      /wrong password/,
    );
    await expect(organisationSetup({ p12Path: files.p12, p12Password: 'org-secret', chainPath: null, tsaUrl: null })).rejects.toThrow(
      /not a root: add the issuing CAs and the root to SIGNING_CHAIN_PATH/,
    );
  });

  it('in production, refuses to start without the PKCS#12 file, and publishes the organisation root as the trust anchor', async () => {
    const production = {
      NODE_ENV: 'production',
      SMTP_URL: 'smtp://relay.example.test:25',
      VOLTFALL_PUBLIC_URL: 'https://voltfall.example.test',
      TSA_URL: 'none',
    };
    const withoutFile = loadConfig({ ...production, SIGNING_P12_PATH: '/nonexistent/org.p12', SIGNING_P12_PASSWORD: 'org-secret' });
    await expect(startSigning(withoutFile)).rejects.toThrow(/Cannot read the signing PKCS#12 file/);

    const signing = await startSigning(
      loadConfig({ ...production, SIGNING_P12_PATH: files.p12, SIGNING_P12_PASSWORD: 'org-secret', SIGNING_CHAIN_PATH: files.ca }),
    );
    try {
      expect(signing.localTsaUrl).toBeNull();
      const bundle = join(dir, 'anchors.pem');
      writeFileSync(bundle, await signing.trustPem());
      const { stdout } = await run('openssl', ['x509', '-in', bundle, '-noout', '-subject']);
      expect(stdout).toContain('CN = Fennel Grid Labs test root');
    } finally {
      await signing.close();
    }
  });
});
