// The local time-stamping authority for development and tests (RFC 3161 over HTTP on loopback),
// issued by the development CA, as the local mail server stands in for SMTP. Production names a
// real authority in TSA_URL.
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import * as asn1js from 'asn1js';
import * as pkijs from 'pkijs';
import { contentInfo, importPrivateKey, OID, randomSerial, signCms, signingCertificateV2Attribute, toArrayBuffer } from './asn1';
import type { KeyPairDer } from './dev-pki';

/** The TSA policy of the development authority, under the ISO/ITU-T "example" arc (2.999): it certifies nothing. */
export const DEV_TSA_POLICY = '2.999.3161.1';
const MAX_REQUEST_BYTES = 64 * 1024;

export interface LocalTsa {
  url: string;
  close(): Promise<void>;
}

/** Starts the authority on 127.0.0.1 (port 0: a free one); its key is read on the first request. */
export async function startLocalTsa(key: () => Promise<KeyPairDer>, port = 0): Promise<LocalTsa> {
  const server: Server = createServer((req, res) => {
    if (req.method !== 'POST') {
      res.writeHead(405, { Allow: 'POST' }).end();
      return;
    }
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_REQUEST_BYTES) req.destroy();
      else chunks.push(chunk);
    });
    req.on('end', () => {
      answer(Buffer.concat(chunks), key).then(
        (reply) => res.writeHead(200, { 'Content-Type': 'application/timestamp-reply' }).end(reply),
        (error: Error) => res.writeHead(400, { 'Content-Type': 'text/plain' }).end(error.message),
      );
    });
  });
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  const { port: bound } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${bound}/`,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

async function answer(body: Buffer, key: () => Promise<KeyPairDer>): Promise<Buffer> {
  const request = pkijs.TimeStampReq.fromBER(toArrayBuffer(body));
  if (request.messageImprint.hashAlgorithm.algorithmId !== OID.sha256) {
    return reply(
      new pkijs.PKIStatusInfo({
        status: pkijs.PKIStatus.rejection,
        statusStrings: [new asn1js.Utf8String({ value: 'only SHA-256 imprints are accepted' })],
      }),
    );
  }
  const tsa = await key();
  const genTime = new Date(Math.floor(Date.now() / 1000) * 1000);
  const info = new pkijs.TSTInfo({
    version: 1,
    policy: DEV_TSA_POLICY,
    messageImprint: request.messageImprint,
    serialNumber: randomSerial(),
    genTime,
    accuracy: new pkijs.Accuracy({ seconds: 1 }),
    ...(request.nonce ? { nonce: request.nonce } : {}),
  });
  const signed = await signCms({
    contentType: OID.tstInfo,
    content: new Uint8Array(info.toSchema().toBER(false)),
    embed: true,
    certificate: tsa.cert,
    certificates: request.certReq ? [tsa.cert] : [],
    privateKey: await importPrivateKey(tsa.key),
    signedAttributes: [signingCertificateV2Attribute(tsa.cert)],
  });
  const token = pkijs.ContentInfo.fromBER(toArrayBuffer(contentInfo(signed)));
  return reply(new pkijs.PKIStatusInfo({ status: pkijs.PKIStatus.granted }), token);
}

function reply(status: pkijs.PKIStatusInfo, token?: pkijs.ContentInfo): Buffer {
  return Buffer.from(new pkijs.TimeStampResp({ status, ...(token ? { timeStampToken: token } : {}) }).toSchema().toBER(false));
}
