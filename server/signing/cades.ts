// The PDF signature itself: CAdES detached (ETSI EN 319 122-1, as PAdES baseline asks), SHA-256 with
// RSA; signed attributes content-type, message-digest and ESS signing-certificate-v2 and deliberately
// no signing-time (PAdES takes the claimed time from the signature dictionary's /M and the trusted
// time from the timestamp); the RFC 3161 signature timestamp as the unsigned attribute
// id-aa-signatureTimeStampToken over the signature value (B-T).
import * as asn1js from 'asn1js';
import * as pkijs from 'pkijs';
import { contentInfo, importPrivateKey, OID, signCms, signingCertificateV2Attribute, toArrayBuffer } from './asn1';
import type { SigningSetup } from './identity';
import { requestTimestamp, type TimestampToken } from './tsa-client';

export interface CadesSignature {
  /** ContentInfo(SignedData), DER: what goes into the PDF's /Contents. */
  cms: Uint8Array;
  /** Null when the setup signs without trusted time. */
  timestamp: TimestampToken | null;
}

export async function cadesDetachedSignature(signedBytes: Uint8Array, setup: SigningSetup): Promise<CadesSignature> {
  const { identity } = setup;
  const signedData = await signCms({
    contentType: OID.data,
    content: signedBytes,
    embed: false,
    certificate: identity.certificate,
    certificates: [identity.certificate, ...identity.chain],
    privateKey: await importPrivateKey(identity.privateKey),
    signedAttributes: [signingCertificateV2Attribute(identity.certificate)],
  });
  if (!setup.tsaUrl) return { cms: contentInfo(signedData), timestamp: null };

  const signerInfo = signedData.signerInfos[0];
  const timestamp = await requestTimestamp(setup.tsaUrl, signerInfo.signature.valueBlock.valueHexView);
  signerInfo.unsignedAttrs = new pkijs.SignedAndUnsignedAttributes({
    type: 1,
    attributes: [new pkijs.Attribute({ type: OID.signatureTimeStampToken, values: [asn1js.fromBER(toArrayBuffer(timestamp.token)).result] })],
  });
  return { cms: contentInfo(signedData), timestamp };
}
