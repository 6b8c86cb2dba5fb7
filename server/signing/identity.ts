// Who signs approved dossiers, and what an assessor needs to validate the signature: the key and
// certificate, the chain up to a root, the trust anchors, where trusted time comes from and how
// revocation data is found. Plain bytes throughout, so the whole setup can be handed to a worker thread.
import { readFile } from 'node:fs/promises';
import forge from 'node-forge';
import { certificatesFromPem, commonNameOf, fingerprint, nameText, parseCertificate } from './asn1';
import type { DevPki } from './dev-pki';

export interface SigningIdentity {
  kind: 'development' | 'organisation';
  /** PKCS#8 DER of the RSA private key. */
  privateKey: Uint8Array;
  /** The signing certificate, DER. */
  certificate: Uint8Array;
  /** Its issuers, nearest first, up to and including the root where known. */
  chain: Uint8Array[];
  /** "CN=…, O=…". */
  subject: string;
  commonName: string;
  /** SHA-256 of the certificate, "AB:CD:…". */
  fingerprintSha256: string;
  notAfter: Date;
}

export interface SigningSetup {
  identity: SigningIdentity;
  /** The RFC 3161 authority for the signature timestamp; null signs without trusted time (TSA_URL=none). */
  tsaUrl: string | null;
  /** Every CA certificate known here (issuing CAs and roots), to build the chains of the signer and of the TSA. */
  caCertificates: Uint8Array[];
  /** The roots the signing and time-stamping chains end in: what `GET /api/signing/trust` publishes. */
  trustAnchors: Uint8Array[];
  /** CRLs known in advance (the development root's); others are fetched from the certificates' distribution points. */
  crls: Uint8Array[];
  /** Fetch CRLs named in the certificates (production); the development PKI names none. */
  fetchCrls: boolean;
}

export function developmentSetup(pki: DevPki, tsaUrl: string | null): SigningSetup {
  const cert = parseCertificate(pki.signer.cert);
  return {
    identity: {
      kind: 'development',
      privateKey: pki.signer.key,
      certificate: pki.signer.cert,
      chain: [pki.root.cert],
      subject: nameText(cert.subject),
      commonName: commonNameOf(cert.subject),
      fingerprintSha256: fingerprint(pki.signer.cert),
      notAfter: cert.notAfter.value,
    },
    tsaUrl,
    caCertificates: [pki.root.cert],
    trustAnchors: [pki.root.cert],
    crls: [pki.crl],
    fetchCrls: false,
  };
}

export interface OrganisationOptions {
  p12Path: string;
  p12Password: string;
  /** PEM bundle of the issuing CAs and roots of the signing certificate and of the TSA, when the PKCS#12 lacks them. */
  chainPath: string | null;
  tsaUrl: string | null;
}

/**
 * The organisation's identity from its PKCS#12 file, opened now so that a wrong password, a file
 * without a usable key or a chain that ends nowhere stops the server at start-up, not at approval.
 */
export async function organisationSetup(options: OrganisationOptions): Promise<SigningSetup> {
  const { p12Path } = options;
  let bytes: Buffer;
  try {
    bytes = await readFile(p12Path);
  } catch (error) {
    throw new Error(`Cannot read the signing PKCS#12 file at ${p12Path}: ${(error as Error).message}`, { cause: error });
  }
  let p12: forge.pkcs12.Pkcs12Pfx;
  try {
    p12 = forge.pkcs12.pkcs12FromAsn1(forge.asn1.fromDer(bytes.toString('binary')), false, options.p12Password);
  } catch (error) {
    throw new Error(`Cannot open the signing PKCS#12 file ${p12Path} (wrong password or not PKCS#12): ${(error as Error).message}`, {
      cause: error,
    });
  }
  const keyBag = p12.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag })[forge.pki.oids.pkcs8ShroudedKeyBag]?.[0];
  const key = keyBag?.key as forge.pki.rsa.PrivateKey | undefined;
  if (!key) throw new Error(`The signing PKCS#12 file ${p12Path} holds no password-protected (PKCS#8 shrouded) private key.`);
  const certs = (p12.getBags({ bagType: forge.pki.oids.certBag })[forge.pki.oids.certBag] ?? [])
    .map((bag) => bag.cert)
    .filter((c): c is forge.pki.Certificate => c !== undefined);
  const own = certs.find((c) => {
    const pub = c.publicKey as forge.pki.rsa.PublicKey;
    return pub.n?.compareTo(key.n) === 0 && pub.e?.compareTo(key.e) === 0;
  });
  if (!own) throw new Error(`The signing PKCS#12 file ${p12Path} holds no RSA certificate matching its private key.`);
  const toDer = (c: forge.pki.Certificate) => new Uint8Array(Buffer.from(forge.asn1.toDer(forge.pki.certificateToAsn1(c)).getBytes(), 'binary'));
  const certificate = toDer(own);
  const extra = options.chainPath ? certificatesFromPem(await readFile(options.chainPath, 'utf8')) : [];
  const caCertificates = [...certs.filter((c) => c !== own).map(toDer), ...extra];

  const chain = chainOf(certificate, caCertificates);
  const top = chain.length ? chain[chain.length - 1] : certificate;
  if (!selfSigned(top)) {
    throw new Error(
      `The signing certificate's chain ends at “${nameText(parseCertificate(top).subject)}”, which is not a root: add the issuing CAs and the root to SIGNING_CHAIN_PATH.`,
    );
  }
  const parsed = parseCertificate(certificate);
  const privateKey = new Uint8Array(Buffer.from(forge.asn1.toDer(forge.pki.wrapRsaPrivateKey(forge.pki.privateKeyToAsn1(key))).getBytes(), 'binary'));
  return {
    identity: {
      kind: 'organisation',
      privateKey,
      certificate,
      chain,
      subject: nameText(parsed.subject),
      commonName: commonNameOf(parsed.subject),
      fingerprintSha256: fingerprint(certificate),
      notAfter: parsed.notAfter.value,
    },
    tsaUrl: options.tsaUrl,
    caCertificates: [...caCertificates, ...(selfSigned(certificate) ? [certificate] : [])],
    trustAnchors: uniqueDer([...caCertificates, certificate].filter(selfSigned)),
    crls: [],
    fetchCrls: true,
  };
}

export function selfSigned(bytes: Uint8Array): boolean {
  const cert = parseCertificate(bytes);
  return cert.subject.isEqual(cert.issuer);
}

/** The issuers of a certificate found in `pool`, nearest first, stopping at a root or where the pool ends. */
export function chainOf(bytes: Uint8Array, pool: readonly Uint8Array[]): Uint8Array[] {
  const chain: Uint8Array[] = [];
  let current = bytes;
  while (!selfSigned(current) && chain.length < 8) {
    const issuer = parseCertificate(current).issuer;
    const next = pool.find((c) => parseCertificate(c).subject.isEqual(issuer) && !chain.includes(c));
    if (!next) break;
    chain.push(next);
    current = next;
  }
  return chain;
}

export function uniqueDer(list: readonly Uint8Array[]): Uint8Array[] {
  const seen = new Set<string>();
  return list.filter((c) => {
    const key = Buffer.from(c).toString('base64');
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
