// Small building blocks over pkijs/asn1js shared by the development PKI, the CAdES signer and the
// time-stamping authority: names, extensions, DER/PEM, ESS signing-certificate-v2 and sorted attributes.
//
// Why pkijs (with its asn1js): it is maintained, pure JavaScript over WebCrypto, and covers every
// structure this needs — X.509 certificates and CRLs, CMS SignedData with signed and unsigned
// attributes, and the RFC 3161 request, response and TSTInfo — so the signer, the local TSA and the
// development CA speak one ASN.1 stack. node-forge (kept for reading PKCS#12 files) cannot add
// arbitrary signed attributes or unsigned attributes to a CMS signature.
import { createHash, webcrypto } from 'node:crypto';
import * as asn1js from 'asn1js';
import * as pkijs from 'pkijs';

pkijs.setEngine('node', new pkijs.CryptoEngine({ name: 'node', crypto: webcrypto as unknown as Crypto }));

export const OID = {
  commonName: '2.5.4.3',
  organization: '2.5.4.10',
  data: '1.2.840.113549.1.7.1',
  signedData: '1.2.840.113549.1.7.2',
  tstInfo: '1.2.840.113549.1.9.16.1.4',
  contentType: '1.2.840.113549.1.9.3',
  messageDigest: '1.2.840.113549.1.9.4',
  signingTime: '1.2.840.113549.1.9.5',
  signingCertificateV2: '1.2.840.113549.1.9.16.2.47',
  signatureTimeStampToken: '1.2.840.113549.1.9.16.2.14',
  sha256: '2.16.840.1.101.3.4.2.1',
  basicConstraints: '2.5.29.19',
  keyUsage: '2.5.29.15',
  extKeyUsage: '2.5.29.37',
  subjectKeyIdentifier: '2.5.29.14',
  authorityKeyIdentifier: '2.5.29.35',
  crlDistributionPoints: '2.5.29.31',
  crlNumber: '2.5.29.20',
  timeStamping: '1.3.6.1.5.5.7.3.8',
} as const;

export const RSA_SHA256: RsaHashedImportParams & RsaHashedKeyGenParams = {
  name: 'RSASSA-PKCS1-v1_5',
  hash: 'SHA-256',
  modulusLength: 2048,
  publicExponent: new Uint8Array([1, 0, 1]),
};

export const sha256 = (bytes: BufferSource | Uint8Array): Buffer => createHash('sha256').update(toBytes(bytes)).digest();

export function toBytes(source: BufferSource | Uint8Array): Uint8Array {
  if (source instanceof Uint8Array) return source;
  if (ArrayBuffer.isView(source)) return new Uint8Array(source.buffer, source.byteOffset, source.byteLength);
  return new Uint8Array(source);
}

/** A copy as a standalone ArrayBuffer, which pkijs and asn1js expect. */
export function toArrayBuffer(bytes: Uint8Array): ArrayBuffer {
  return bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
}

export const der = (object: { toSchema(encodeFlag?: boolean): asn1js.AsnType }): Uint8Array => new Uint8Array(object.toSchema(true).toBER(false));

export function parseCertificate(bytes: Uint8Array): pkijs.Certificate {
  return pkijs.Certificate.fromBER(toArrayBuffer(bytes));
}

export function pem(label: 'CERTIFICATE' | 'X509 CRL', bytes: Uint8Array): string {
  const body = Buffer.from(bytes)
    .toString('base64')
    .replace(/(.{64})/g, '$1\n')
    .replace(/\n$/, '');
  return `-----BEGIN ${label}-----\n${body}\n-----END ${label}-----\n`;
}

/** Every certificate in a PEM bundle, as DER. */
export function certificatesFromPem(text: string): Uint8Array[] {
  return [...text.matchAll(/-----BEGIN CERTIFICATE-----([\s\S]*?)-----END CERTIFICATE-----/g)].map(
    (m) => new Uint8Array(Buffer.from(m[1].replace(/\s+/g, ''), 'base64')),
  );
}

/**
 * O then CN, each in its own RDN (pkijs would put both in one multi-valued RDN); parsed back from DER so
 * pkijs keeps this encoding.
 */
export function distinguishedName(commonName: string, organization: string): pkijs.RelativeDistinguishedNames {
  const rdn = (type: string, value: string) =>
    new asn1js.Set({ value: [new pkijs.AttributeTypeAndValue({ type, value: new asn1js.Utf8String({ value }) }).toSchema()] });
  const name = new asn1js.Sequence({ value: [rdn(OID.organization, organization), rdn(OID.commonName, commonName)] });
  return pkijs.RelativeDistinguishedNames.fromBER(name.toBER(false));
}

const SHORT_NAMES: Record<string, string> = { [OID.commonName]: 'CN', [OID.organization]: 'O', '2.5.4.6': 'C', '2.5.4.11': 'OU', '2.5.4.7': 'L' };

/** "CN=…, O=…", most specific first, as readers print a subject. */
export function nameText(name: pkijs.RelativeDistinguishedNames): string {
  return [...name.typesAndValues]
    .reverse()
    .map((tv) => `${SHORT_NAMES[tv.type] ?? tv.type}=${String((tv.value as { valueBlock: { value: unknown } }).valueBlock.value)}`)
    .join(', ');
}

export function commonNameOf(name: pkijs.RelativeDistinguishedNames): string {
  const cn = name.typesAndValues.find((tv) => tv.type === OID.commonName);
  return cn ? String((cn.value as { valueBlock: { value: unknown } }).valueBlock.value) : nameText(name);
}

/** SHA-256 of a certificate's DER, upper-case hex pairs joined by colons, as certificate viewers show it. */
export function fingerprint(bytes: Uint8Array): string {
  return sha256(bytes).toString('hex').toUpperCase().match(/../g)!.join(':');
}

/** A positive serial number of 16 random bytes (the top bit cleared, so DER needs no sign byte). */
export function randomSerial(): asn1js.Integer {
  const bytes = webcrypto.getRandomValues(new Uint8Array(16));
  bytes[0] = (bytes[0] & 0x7f) | 0x01;
  return new asn1js.Integer({ valueHex: toArrayBuffer(bytes) });
}

/** KeyUsage bits in RFC 5280 order; DER wants the unused trailing bits counted. */
export type KeyUsageBit = 'digitalSignature' | 'nonRepudiation' | 'keyCertSign' | 'cRLSign';
const KEY_USAGE_INDEX: Record<KeyUsageBit, number> = { digitalSignature: 0, nonRepudiation: 1, keyCertSign: 5, cRLSign: 6 };

export function keyUsageExtension(bits: KeyUsageBit[]): pkijs.Extension {
  const indices = bits.map((b) => KEY_USAGE_INDEX[b]);
  const byte = indices.reduce((acc, i) => acc | (0x80 >> i), 0);
  const unusedBits = 7 - Math.max(...indices);
  const value = new asn1js.BitString({ valueHex: new Uint8Array([byte]).buffer, unusedBits });
  return new pkijs.Extension({ extnID: OID.keyUsage, critical: true, extnValue: value.toBER(false) });
}

export function basicConstraintsExtension(cA: boolean): pkijs.Extension {
  return new pkijs.Extension({ extnID: OID.basicConstraints, critical: true, extnValue: new pkijs.BasicConstraints({ cA }).toSchema().toBER(false) });
}

export function extKeyUsageExtension(purposes: string[]): pkijs.Extension {
  return new pkijs.Extension({
    extnID: OID.extKeyUsage,
    critical: true,
    extnValue: new pkijs.ExtKeyUsage({ keyPurposes: purposes }).toSchema().toBER(false),
  });
}

/** RFC 5280 method 1: SHA-1 of the subjectPublicKey bit string (an identifier, not a security use of SHA-1). */
export function keyIdentifier(cert: pkijs.Certificate): Uint8Array {
  const key = cert.subjectPublicKeyInfo.subjectPublicKey.valueBlock.valueHexView;
  return new Uint8Array(createHash('sha1').update(key).digest());
}

export function subjectKeyIdentifierExtension(id: Uint8Array): pkijs.Extension {
  return new pkijs.Extension({
    extnID: OID.subjectKeyIdentifier,
    critical: false,
    extnValue: new asn1js.OctetString({ valueHex: toArrayBuffer(id) }).toBER(false),
  });
}

export function authorityKeyIdentifierExtension(id: Uint8Array): pkijs.Extension {
  return new pkijs.Extension({
    extnID: OID.authorityKeyIdentifier,
    critical: false,
    extnValue: new pkijs.AuthorityKeyIdentifier({ keyIdentifier: new asn1js.OctetString({ valueHex: toArrayBuffer(id) }) }).toSchema().toBER(false),
  });
}

/** The http(s) URLs of a certificate's CRL distribution points. */
export function crlUrls(cert: pkijs.Certificate): string[] {
  const ext = cert.extensions?.find((e) => e.extnID === OID.crlDistributionPoints);
  if (!ext) return [];
  const points = new pkijs.CRLDistributionPoints({ schema: asn1js.fromBER(ext.extnValue.valueBlock.valueHexView).result });
  return points.distributionPoints.flatMap((p) => {
    const names = Array.isArray(p.distributionPoint) ? p.distributionPoint : [];
    return names.filter((n) => n.type === 6 && /^https?:/i.test(String(n.value))).map((n) => String(n.value));
  });
}

/**
 * ESS signing-certificate-v2 (RFC 5035): the SHA-256 of the signer's certificate and its issuer and
 * serial, so the signature binds the certificate itself and a substituted one is detected.
 * ESSCertIDv2's hashAlgorithm defaults to SHA-256 and is therefore left out (DER omits defaults).
 */
export function signingCertificateV2Attribute(certDer: Uint8Array): pkijs.Attribute {
  const cert = parseCertificate(certDer);
  const issuerSerial = new asn1js.Sequence({
    value: [new pkijs.GeneralNames({ names: [new pkijs.GeneralName({ type: 4, value: cert.issuer })] }).toSchema(), cert.serialNumber],
  });
  const essCertIdV2 = new asn1js.Sequence({ value: [new asn1js.OctetString({ valueHex: toArrayBuffer(sha256(certDer)) }), issuerSerial] });
  const signingCertificateV2 = new asn1js.Sequence({ value: [new asn1js.Sequence({ value: [essCertIdV2] })] });
  return new pkijs.Attribute({ type: OID.signingCertificateV2, values: [signingCertificateV2] });
}

/**
 * Signed attributes are a DER SET OF, which is sorted by encoding; verifiers such as OpenSSL re-encode
 * the set before checking the signature, so an unsorted set would not verify there.
 */
export function sortedAttributes(attributes: pkijs.Attribute[]): pkijs.Attribute[] {
  const encoded = attributes.map((a) => ({ a, bytes: Buffer.from(a.toSchema().toBER(false)) }));
  return encoded.sort((x, y) => Buffer.compare(x.bytes, y.bytes)).map((e) => e.a);
}

export async function importPrivateKey(pkcs8: Uint8Array): Promise<CryptoKey> {
  return webcrypto.subtle.importKey('pkcs8', toArrayBuffer(pkcs8), RSA_SHA256, false, ['sign']) as Promise<CryptoKey>;
}

/**
 * CMS SignedData (RFC 5652) with one signer identified by issuer and serial, SHA-256 with RSA, and the
 * given signed attributes (content-type and message-digest are added here). `eContent` is embedded
 * (a time-stamp token's TSTInfo); without it the signature is detached (a PDF's byte ranges).
 */
export async function signCms(options: {
  contentType: string;
  content: Uint8Array;
  embed: boolean;
  certificate: Uint8Array;
  certificates: Uint8Array[];
  privateKey: CryptoKey;
  signedAttributes: pkijs.Attribute[];
}): Promise<pkijs.SignedData> {
  const cert = parseCertificate(options.certificate);
  const attributes = sortedAttributes([
    new pkijs.Attribute({ type: OID.contentType, values: [new asn1js.ObjectIdentifier({ value: options.contentType })] }),
    new pkijs.Attribute({ type: OID.messageDigest, values: [new asn1js.OctetString({ valueHex: toArrayBuffer(sha256(options.content)) })] }),
    ...options.signedAttributes,
  ]);
  const signedData = new pkijs.SignedData({
    version: options.contentType === OID.data ? 1 : 3,
    encapContentInfo: new pkijs.EncapsulatedContentInfo({
      eContentType: options.contentType,
      ...(options.embed ? { eContent: new asn1js.OctetString({ valueHex: toArrayBuffer(options.content) }) } : {}),
    }),
    signerInfos: [
      new pkijs.SignerInfo({
        version: 1,
        sid: new pkijs.IssuerAndSerialNumber({ issuer: cert.issuer, serialNumber: cert.serialNumber }),
        signedAttrs: new pkijs.SignedAndUnsignedAttributes({ type: 0, attributes }),
      }),
    ],
    certificates: options.certificates.map(parseCertificate),
  });
  await signedData.sign(options.privateKey, 0, 'SHA-256');
  return signedData;
}

export function contentInfo(signedData: pkijs.SignedData): Uint8Array {
  return new Uint8Array(new pkijs.ContentInfo({ contentType: OID.signedData, content: signedData.toSchema(true) }).toSchema().toBER(false));
}
