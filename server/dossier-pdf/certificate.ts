import { randomBytes } from 'node:crypto';
import { mkdir, readFile, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import forge from 'node-forge';

/** The key and certificate that sign approved dossiers, as the PKCS#12 bytes the signer reads. */
export interface SigningIdentity {
  kind: 'development' | 'organisation';
  p12: Buffer;
  password: string;
  /** The certificate's subject, e.g. "CN=…, O=…", printed on the dossier. */
  subject: string;
  /** SHA-256 of the certificate (DER), upper-case hex with colons, so an assessor can compare it. */
  fingerprintSha256: string;
  notAfter: Date;
}

export interface SigningIdentityOptions {
  dataDir: string;
  p12Path?: string | null;
  p12Password?: string | null;
  production: boolean;
}

export const DEV_CERTIFICATE_NAME = 'Voltfall development signing (not for certification)';
export const DEV_P12_FILE = 'dev-signing.p12';
// The development key protects nothing of value; a fixed passphrase lets every process reuse the file.
const DEV_P12_PASSWORD = 'voltfall-development-only';

const pending = new Map<string, Promise<SigningIdentity>>();

/**
 * Production: reads the organisation's PKCS#12 file (path and password required).
 * Elsewhere: uses the configured file when one is given, otherwise creates a self-signed development
 * certificate once in `${dataDir}/dev-signing.p12` and reuses it.
 */
export async function loadOrCreateSigningIdentity(options: SigningIdentityOptions): Promise<SigningIdentity> {
  const { p12Path, p12Password, production } = options;
  if (production && (!p12Path || !p12Password)) {
    const missing = [!p12Path && 'p12Path (SIGNING_P12_PATH)', !p12Password && 'p12Password (SIGNING_P12_PASSWORD)'].filter(Boolean);
    throw new Error(`Signing in production needs the organisation's PKCS#12 file and password; missing: ${missing.join(', ')}`);
  }
  if (p12Path) {
    let bytes: Buffer;
    try {
      bytes = await readFile(p12Path);
    } catch (error) {
      throw new Error(`Cannot read the signing PKCS#12 file at ${p12Path}: ${(error as Error).message}`);
    }
    return identityFromP12(bytes, p12Password ?? '', 'organisation', p12Path);
  }
  const devPath = join(options.dataDir, DEV_P12_FILE);
  // Concurrent first requests share one creation, so they agree on the same key; later calls read the file.
  let identity = pending.get(devPath);
  if (!identity) {
    identity = readOrCreateDevIdentity(options.dataDir, devPath).finally(() => pending.delete(devPath));
    pending.set(devPath, identity);
  }
  return identity;
}

async function readOrCreateDevIdentity(dataDir: string, devPath: string): Promise<SigningIdentity> {
  let bytes: Buffer | null = null;
  try {
    bytes = await readFile(devPath);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
  }
  if (!bytes) {
    bytes = createDevP12();
    await mkdir(dataDir, { recursive: true });
    const temp = `${devPath}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`;
    await writeFile(temp, bytes, { mode: 0o600 });
    await rename(temp, devPath);
  }
  return identityFromP12(bytes, DEV_P12_PASSWORD, 'development', devPath);
}

function createDevP12(): Buffer {
  // forge hands key generation to Node's native crypto when it is available, so this takes milliseconds.
  const keys = forge.pki.rsa.generateKeyPair({ bits: 2048, e: 0x10001 });
  const cert = forge.pki.createCertificate();
  cert.publicKey = keys.publicKey;
  // A positive serial: the leading byte stays below 0x80.
  cert.serialNumber = `01${randomBytes(15).toString('hex')}`;
  const now = new Date();
  cert.validity.notBefore = new Date(now.getTime() - 60_000);
  cert.validity.notAfter = new Date(now.getTime());
  cert.validity.notAfter.setFullYear(now.getFullYear() + 10);
  const attrs = [
    { name: 'commonName', value: DEV_CERTIFICATE_NAME },
    { name: 'organizationName', value: 'Voltfall development' },
  ];
  cert.setSubject(attrs);
  cert.setIssuer(attrs);
  cert.setExtensions([
    { name: 'basicConstraints', cA: false },
    { name: 'keyUsage', critical: true, digitalSignature: true, nonRepudiation: true },
    { name: 'subjectKeyIdentifier' },
  ]);
  cert.sign(keys.privateKey, forge.md.sha256.create());
  const asn1 = forge.pkcs12.toPkcs12Asn1(keys.privateKey, [cert], DEV_P12_PASSWORD, {
    algorithm: 'aes256',
    friendlyName: DEV_CERTIFICATE_NAME,
  });
  return Buffer.from(forge.asn1.toDer(asn1).getBytes(), 'binary');
}

/** Opens the PKCS#12 now, so a wrong password or a file without a usable key fails at start-up, not at approval. */
function identityFromP12(bytes: Buffer, password: string, kind: SigningIdentity['kind'], origin: string): SigningIdentity {
  let p12: forge.pkcs12.Pkcs12Pfx;
  try {
    p12 = forge.pkcs12.pkcs12FromAsn1(forge.asn1.fromDer(bytes.toString('binary')), false, password);
  } catch (error) {
    throw new Error(`Cannot open the signing PKCS#12 file ${origin} (wrong password or not PKCS#12): ${(error as Error).message}`);
  }
  const keyBag = p12.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag })[forge.pki.oids.pkcs8ShroudedKeyBag]?.[0];
  const key = keyBag?.key as forge.pki.rsa.PrivateKey | undefined;
  if (!key) {
    throw new Error(`The signing PKCS#12 file ${origin} holds no password-protected (PKCS#8 shrouded) private key.`);
  }
  const certs = (p12.getBags({ bagType: forge.pki.oids.certBag })[forge.pki.oids.certBag] ?? [])
    .map((bag) => bag.cert)
    .filter((cert): cert is forge.pki.Certificate => cert !== undefined);
  const cert = certs.find((c) => {
    const pub = c.publicKey as forge.pki.rsa.PublicKey;
    return pub.n?.compareTo(key.n) === 0 && pub.e?.compareTo(key.e) === 0;
  });
  if (!cert) {
    throw new Error(`The signing PKCS#12 file ${origin} holds no RSA certificate matching its private key.`);
  }
  const der = forge.asn1.toDer(forge.pki.certificateToAsn1(cert)).getBytes();
  const digest = forge.md.sha256.create().update(der).digest().toHex().toUpperCase();
  return {
    kind,
    p12: bytes,
    password,
    subject: cert.subject.attributes.map((a) => `${a.shortName ?? a.name}=${String(a.value)}`).join(', '),
    fingerprintSha256: digest.match(/../g)!.join(':'),
    notAfter: cert.validity.notAfter,
  };
}
