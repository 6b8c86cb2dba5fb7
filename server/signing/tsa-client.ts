// RFC 3161 over HTTP: asks a time-stamping authority for a token over some bytes and checks the
// answer before it goes into a signature (status, nonce, imprint, and the token's own CMS signature).
import { webcrypto } from 'node:crypto';
import * as asn1js from 'asn1js';
import * as pkijs from 'pkijs';
import { OID, sha256, toArrayBuffer } from './asn1';

export interface TimestampToken {
  /** The token: a CMS ContentInfo (SignedData over TSTInfo), DER. */
  token: Uint8Array;
  /** The trusted time the authority put in the token. */
  genTime: Date;
  /** Certificates the token carries (the authority's own, at least, since the request asks for it). */
  certificates: Uint8Array[];
}

const TIMEOUT_MS = 15_000;

export async function requestTimestamp(url: string, data: Uint8Array): Promise<TimestampToken> {
  const imprint = sha256(data);
  const nonce = webcrypto.getRandomValues(new Uint8Array(8));
  nonce[0] &= 0x7f;
  const request = new pkijs.TimeStampReq({
    version: 1,
    messageImprint: new pkijs.MessageImprint({
      hashAlgorithm: new pkijs.AlgorithmIdentifier({ algorithmId: OID.sha256 }),
      hashedMessage: new asn1js.OctetString({ valueHex: toArrayBuffer(imprint) }),
    }),
    nonce: new asn1js.Integer({ valueHex: toArrayBuffer(nonce) }),
    certReq: true,
  });
  let response: Response;
  try {
    response = await fetch(url, {
      method: 'POST',
      headers: { 'Content-Type': 'application/timestamp-query', Accept: 'application/timestamp-reply' },
      body: Buffer.from(request.toSchema().toBER(false)),
      signal: AbortSignal.timeout(TIMEOUT_MS),
    });
  } catch (error) {
    throw new Error(`The time-stamping authority at ${url} did not answer: ${(error as Error).message}`, { cause: error });
  }
  if (!response.ok) throw new Error(`The time-stamping authority at ${url} answered HTTP ${response.status}.`);
  const reply = pkijs.TimeStampResp.fromBER(await response.arrayBuffer());
  if (reply.status.status !== pkijs.PKIStatus.granted && reply.status.status !== pkijs.PKIStatus.grantedWithMods) {
    const why = reply.status.statusStrings?.map((s) => s.valueBlock.value).join('; ') ?? '';
    throw new Error(`The time-stamping authority at ${url} refused the request (status ${reply.status.status}${why ? `: ${why}` : ''}).`);
  }
  if (!reply.timeStampToken) throw new Error(`The time-stamping authority at ${url} granted no token.`);

  const signed = new pkijs.SignedData({ schema: reply.timeStampToken.content });
  const eContent = signed.encapContentInfo.eContent;
  if (signed.encapContentInfo.eContentType !== OID.tstInfo || !eContent) throw new Error('The time-stamp token holds no TSTInfo.');
  const tstInfo = eContent.getValue();
  const info = pkijs.TSTInfo.fromBER(tstInfo);
  if (!Buffer.from(info.messageImprint.hashedMessage.valueBlock.valueHexView).equals(imprint)) {
    throw new Error('The time-stamp token covers other data than was sent.');
  }
  if (!info.nonce || !Buffer.from(info.nonce.valueBlock.valueHexView).equals(Buffer.from(nonce))) {
    throw new Error('The time-stamp token does not repeat the request nonce (a replayed answer?).');
  }
  // asn1js reads an OCTET STRING whose bytes are themselves DER as nested content, and pkijs's TSTInfo
  // check then finds no bytes: hand it the plain octets.
  signed.encapContentInfo.eContent = new asn1js.OctetString({ valueHex: tstInfo });
  const verified = await signed.verify({ signer: 0, data: toArrayBuffer(data), checkChain: false, extendedMode: true });
  if (!verified.signatureVerified) throw new Error('The time-stamp token’s signature does not verify.');

  return {
    token: new Uint8Array(reply.timeStampToken.toSchema().toBER(false)),
    genTime: info.genTime,
    certificates: (signed.certificates ?? [])
      .filter((c): c is pkijs.Certificate => c instanceof pkijs.Certificate)
      .map((c) => new Uint8Array(c.toSchema().toBER(false))),
  };
}
