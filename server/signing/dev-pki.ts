// The development PKI, generated once outside production (in the data folder, or once per PostgreSQL
// database so that every instance signs alike): a root CA, the
// certificate that signs dossiers (non-repudiation, digital signature), the local time-stamping
// authority's certificate (extended key usage timeStamping, critical) and a CRL from the root.
// Every name says "not for certification"; the keys protect nothing of value.
import { randomBytes, webcrypto } from 'node:crypto';
import { link, mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import * as asn1js from 'asn1js';
import * as pkijs from 'pkijs';
import {
  authorityKeyIdentifierExtension,
  basicConstraintsExtension,
  der,
  distinguishedName,
  extKeyUsageExtension,
  keyIdentifier,
  keyUsageExtension,
  OID,
  parseCertificate,
  RSA_SHA256,
  randomSerial,
  subjectKeyIdentifierExtension,
  toArrayBuffer,
  type KeyUsageBit,
} from './asn1';

export const DEV_PKI_FILE = 'dev-pki.json';
export const DEV_ORGANISATION = 'Voltfall development';
export const DEV_NAMES = {
  root: 'Voltfall development root CA (not for certification)',
  signer: 'Voltfall development signing (not for certification)',
  tsa: 'Voltfall development time-stamping (not for certification)',
} as const;

const YEARS = 10;
/** A fresh CRL is issued once the stored one has less than this left before its next update. */
const CRL_VALIDITY_DAYS = 30;
const CRL_RENEW_DAYS = 7;

export interface KeyPairDer {
  /** X.509 certificate, DER. */
  cert: Uint8Array;
  /** PKCS#8 private key, DER. */
  key: Uint8Array;
}

export interface DevPki {
  root: KeyPairDer;
  signer: KeyPairDer;
  tsa: KeyPairDer;
  /** The root's CRL (no certificate revoked), DER. */
  crl: Uint8Array;
}

interface StoredPki {
  version: 1;
  root: { cert: string; key: string };
  signer: { cert: string; key: string };
  tsa: { cert: string; key: string };
  crl: string;
}

/**
 * Where the development PKI is kept: the data folder's dev-pki.json, or (several instances on one
 * PostgreSQL database) one row of the database. `createIfAbsent` never replaces what a concurrent first
 * start stored: both starts end up with the first one's keys, not with a root that no longer matches
 * the stored certificates.
 */
export interface PkiStorage {
  /** A key for sharing concurrent first calls within this process. */
  readonly id: string;
  read(): Promise<string | null>;
  createIfAbsent(text: string): Promise<void>;
  /** Replaces the stored text (same keys, a fresh CRL): safe whoever wins. */
  replace(text: string): Promise<void>;
}

/** dev-pki.json in the data folder (the single-machine default). */
export function folderPkiStorage(dataDir: string): PkiStorage {
  const file = join(dataDir, DEV_PKI_FILE);
  const writeTemp = async (text: string) => {
    const temp = `${file}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`;
    await writeFile(temp, text, { mode: 0o600 });
    return temp;
  };
  return {
    id: file,
    async read() {
      try {
        return await readFile(file, 'utf8');
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw error;
      }
    },
    async createIfAbsent(text) {
      await mkdir(dataDir, { recursive: true });
      // link() refuses to replace a file.
      const temp = await writeTemp(text);
      try {
        await link(temp, file);
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      } finally {
        await rm(temp, { force: true });
      }
    },
    async replace(text) {
      await rename(await writeTemp(text), file);
    },
  };
}

const pending = new Map<string, Promise<DevPki>>();

/** Reads the development PKI from the data folder, creating it on first use and renewing its CRL when due. */
export function loadOrCreateDevPki(dataDir: string): Promise<DevPki> {
  return loadOrCreateDevPkiIn(folderPkiStorage(dataDir));
}

/** Reads the development PKI from `storage`, creating it on first use and renewing its CRL when due. */
export function loadOrCreateDevPkiIn(storage: PkiStorage): Promise<DevPki> {
  // Concurrent first calls share one creation, so every caller gets the same keys.
  let pki = pending.get(storage.id);
  if (!pki) {
    pki = readOrCreate(storage).finally(() => pending.delete(storage.id));
    pending.set(storage.id, pki);
  }
  return pki;
}

async function readOrCreate(storage: PkiStorage): Promise<DevPki> {
  const text = await storage.read();
  if (text === null) {
    await storage.createIfAbsent(JSON.stringify(store(await createPki())));
    return parsePki((await storage.read())!);
  }
  const existing = parsePki(text);
  if (crlDue(existing.crl)) {
    existing.crl = await issueCrl(existing.root);
    await storage.replace(JSON.stringify(store(existing)));
  }
  return existing;
}

function parsePki(text: string): DevPki {
  const stored = JSON.parse(text) as StoredPki;
  const b = (s: string) => new Uint8Array(Buffer.from(s, 'base64'));
  const pair = (p: StoredPki['root']) => ({ cert: b(p.cert), key: b(p.key) });
  return { root: pair(stored.root), signer: pair(stored.signer), tsa: pair(stored.tsa), crl: b(stored.crl) };
}

function store(pki: DevPki): StoredPki {
  const s = (bytes: Uint8Array) => Buffer.from(bytes).toString('base64');
  const pair = (p: KeyPairDer) => ({ cert: s(p.cert), key: s(p.key) });
  return { version: 1, root: pair(pki.root), signer: pair(pki.signer), tsa: pair(pki.tsa), crl: s(pki.crl) };
}

function crlDue(crl: Uint8Array): boolean {
  const next = pkijs.CertificateRevocationList.fromBER(toArrayBuffer(crl)).nextUpdate?.value;
  return !next || next.getTime() - Date.now() < CRL_RENEW_DAYS * 86_400_000;
}

async function createPki(): Promise<DevPki> {
  const root = await issue({ commonName: DEV_NAMES.root, ca: true, keyUsage: ['keyCertSign', 'cRLSign'] });
  const signer = await issue({ commonName: DEV_NAMES.signer, ca: false, keyUsage: ['digitalSignature', 'nonRepudiation'], issuer: root });
  const tsa = await issue({
    commonName: DEV_NAMES.tsa,
    ca: false,
    keyUsage: ['digitalSignature', 'nonRepudiation'],
    extKeyUsage: [OID.timeStamping],
    issuer: root,
  });
  return { root, signer, tsa, crl: await issueCrl(root) };
}

interface IssueOptions {
  commonName: string;
  ca: boolean;
  keyUsage: KeyUsageBit[];
  extKeyUsage?: string[];
  /** Self-signed when absent. */
  issuer?: KeyPairDer;
}

async function issue(options: IssueOptions): Promise<KeyPairDer> {
  const keys = (await webcrypto.subtle.generateKey(RSA_SHA256, true, ['sign', 'verify'])) as CryptoKeyPair;
  const cert = new pkijs.Certificate();
  cert.version = 2;
  cert.serialNumber = randomSerial();
  const subject = distinguishedName(options.commonName, DEV_ORGANISATION);
  cert.subject = subject;
  const now = Date.now();
  cert.notBefore.value = new Date(now - 60_000);
  const notAfter = new Date(now);
  notAfter.setUTCFullYear(notAfter.getUTCFullYear() + YEARS);
  cert.notAfter.value = notAfter;
  await cert.subjectPublicKeyInfo.importKey(keys.publicKey);

  const issuerCert = options.issuer ? parseCertificate(options.issuer.cert) : null;
  cert.issuer = issuerCert ? issuerCert.subject : subject;
  const ownId = keyIdentifier(cert);
  cert.extensions = [
    basicConstraintsExtension(options.ca),
    keyUsageExtension(options.keyUsage),
    ...(options.extKeyUsage ? [extKeyUsageExtension(options.extKeyUsage)] : []),
    subjectKeyIdentifierExtension(ownId),
    authorityKeyIdentifierExtension(issuerCert ? keyIdentifier(issuerCert) : ownId),
  ];
  const signingKey = options.issuer
    ? await webcrypto.subtle.importKey('pkcs8', toArrayBuffer(options.issuer.key), RSA_SHA256, false, ['sign'])
    : keys.privateKey;
  await cert.sign(signingKey as CryptoKey, 'SHA-256');
  const key = new Uint8Array(await webcrypto.subtle.exportKey('pkcs8', keys.privateKey));
  return { cert: der(cert), key };
}

async function issueCrl(root: KeyPairDer): Promise<Uint8Array> {
  const rootCert = parseCertificate(root.cert);
  const crl = new pkijs.CertificateRevocationList();
  crl.version = 1;
  crl.issuer = rootCert.subject;
  const now = Date.now();
  crl.thisUpdate = new pkijs.Time({ type: 0, value: new Date(now - 60_000) });
  crl.nextUpdate = new pkijs.Time({ type: 0, value: new Date(now + CRL_VALIDITY_DAYS * 86_400_000) });
  crl.crlExtensions = new pkijs.Extensions({
    extensions: [
      authorityKeyIdentifierExtension(keyIdentifier(rootCert)),
      new pkijs.Extension({ extnID: OID.crlNumber, critical: false, extnValue: new asn1js.Integer({ value: Math.floor(now / 1000) }).toBER(false) }),
    ],
  });
  const key = await webcrypto.subtle.importKey('pkcs8', toArrayBuffer(root.key), RSA_SHA256, false, ['sign']);
  await crl.sign(key as CryptoKey, 'SHA-256');
  return der(crl);
}
