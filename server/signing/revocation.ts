// What the document security store holds: the certificates of the signer's chain and of the TSA's,
// and CRLs covering each certificate that is not a root. The development root's CRL is known in
// advance; an organisation's CRLs are fetched from the distribution points its certificates name
// and kept until their next update.
import * as pkijs from 'pkijs';
import { crlUrls, parseCertificate, toArrayBuffer } from './asn1';
import type { ValidationData } from './dss';
import { chainOf, selfSigned, uniqueDer, type SigningSetup } from './identity';
import type { TimestampToken } from './tsa-client';

const FETCH_TIMEOUT_MS = 10_000;
const cache = new Map<string, { crl: Uint8Array; until: number }>();

export async function validationData(setup: SigningSetup, timestamp: TimestampToken | null): Promise<ValidationData> {
  const pool = uniqueDer([...setup.caCertificates, ...(timestamp?.certificates ?? [])]);
  const tsaCerts = (timestamp?.certificates ?? []).filter((c) => !setup.caCertificates.some((ca) => Buffer.from(ca).equals(Buffer.from(c))));
  const certificates = uniqueDer([setup.identity.certificate, ...setup.identity.chain, ...tsaCerts.flatMap((c) => [c, ...chainOf(c, pool)])]);
  const crls = [...setup.crls];
  if (setup.fetchCrls) {
    for (const cert of certificates.filter((c) => !selfSigned(c))) crls.push(...(await fetchCrls(cert)));
  }
  return { certificates, crls: uniqueDer(crls) };
}

async function fetchCrls(cert: Uint8Array): Promise<Uint8Array[]> {
  const urls = crlUrls(parseCertificate(cert));
  const found: Uint8Array[] = [];
  for (const url of urls) {
    const hit = cache.get(url);
    if (hit && hit.until > Date.now()) {
      found.push(hit.crl);
      continue;
    }
    let bytes: Uint8Array;
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(FETCH_TIMEOUT_MS) });
      if (!res.ok) throw new Error(`HTTP ${res.status}`);
      bytes = new Uint8Array(await res.arrayBuffer());
    } catch (error) {
      throw new Error(`Revocation data for the signature could not be fetched from ${url}: ${(error as Error).message}`, { cause: error });
    }
    const next = pkijs.CertificateRevocationList.fromBER(toArrayBuffer(bytes)).nextUpdate?.value;
    cache.set(url, { crl: bytes, until: next ? next.getTime() : Date.now() + 3_600_000 });
    found.push(bytes);
  }
  return found;
}
