// Reads a signed PDF with tools from outside the project: NSS's certutil builds the trust store that
// pdfsig validates against, OpenSSL parses and verifies the CMS signature and its RFC 3161 token,
// qpdf reads the document security store through the file's own cross-reference tables.
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tool, type ToolOutput } from './poppler';

async function ok(command: string, args: string[]): Promise<ToolOutput> {
  const out = await tool(command, args);
  if (out.code !== 0) throw new Error(`${command} ${args.join(' ')} failed: ${out.stderr}${out.stdout}`);
  return out;
}

/** An NSS database (certutil) that trusts the given PEM roots for signing. */
export async function nssDatabase(dir: string, roots: Record<string, string>): Promise<string> {
  mkdirSync(dir, { recursive: true });
  await ok('certutil', ['-N', '-d', `sql:${dir}`, '--empty-password']);
  for (const [nickname, pemFile] of Object.entries(roots))
    await ok('certutil', ['-A', '-d', `sql:${dir}`, '-n', nickname, '-t', 'C,C,C', '-i', pemFile]);
  return dir;
}

export interface SignatureParts {
  byteRange: [number, number, number, number];
  /** The CMS from /Contents without its zero padding, DER. */
  cms: Buffer;
  /** The bytes the signature covers. */
  signed: Buffer;
}

export function signatureParts(pdf: Buffer): SignatureParts {
  const match = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/.exec(pdf.toString('latin1'));
  if (!match) throw new Error('no /ByteRange in the PDF');
  const byteRange = match.slice(1, 5).map(Number) as [number, number, number, number];
  const [a, b, c, d] = byteRange;
  const hex = pdf.subarray(b + 1, c - 1).toString('latin1');
  const raw = Buffer.from(hex, 'hex');
  // DER length of the outer SEQUENCE (long form): the rest is the placeholder's zero padding.
  const lengthBytes = raw[1] & 0x7f;
  const length = raw[1] & 0x80 ? raw.subarray(2, 2 + lengthBytes).readUIntBE(0, lengthBytes) + 2 + lengthBytes : raw[1] + 2;
  return { byteRange, cms: raw.subarray(0, length), signed: Buffer.concat([pdf.subarray(a, a + b), pdf.subarray(c, c + d)]) };
}

interface Asn1Line {
  offset: number;
  header: number;
  length: number;
  text: string;
}

export async function asn1parse(file: string): Promise<Asn1Line[]> {
  const { stdout } = await ok('openssl', ['asn1parse', '-inform', 'DER', '-in', file]);
  return stdout
    .split('\n')
    .map((line) => /^\s*(\d+):d=\s*\d+\s+hl=\s*(\d+)\s+l=\s*(\d+)\s+(.*)$/.exec(line))
    .filter((m): m is RegExpExecArray => m !== null)
    .map((m) => ({ offset: Number(m[1]), header: Number(m[2]), length: Number(m[3]), text: m[4] }));
}

/**
 * The signature value (the signer's OCTET STRING just before its unsigned attributes) and the RFC 3161
 * token (the ContentInfo inside the id-smime-aa-timeStampToken attribute), located by OpenSSL.
 */
export async function timestampParts(cms: Buffer, dir: string): Promise<{ signatureValue: Buffer; tokenFile: string }> {
  const cmsFile = join(dir, 'signature.der');
  writeFileSync(cmsFile, cms);
  const lines = await asn1parse(cmsFile);
  const attr = lines.findIndex((l) => l.text.includes(':id-smime-aa-timeStampToken'));
  if (attr < 0) throw new Error('the CMS has no signature timestamp attribute');
  const token = lines[attr + 2];
  const value = [...lines.slice(0, attr)].reverse().find((l) => l.text.startsWith('prim: OCTET STRING') && l.length === 256);
  if (!value) throw new Error('no signature value before the unsigned attributes');
  const tokenFile = join(dir, 'token.der');
  writeFileSync(tokenFile, cms.subarray(token.offset, token.offset + token.header + token.length));
  return { signatureValue: cms.subarray(value.offset + value.header, value.offset + value.header + value.length), tokenFile };
}

/** Object numbers and streams of the /DSS, read by qpdf from the final revision of the file. */
export async function securityStore(file: string, dir: string): Promise<{ certs: string[]; crls: string[] }> {
  const trailer = (await ok('qpdf', ['--show-object=trailer', file])).stdout;
  const root = /\/Root (\d+) 0 R/.exec(trailer)![1];
  const catalog = (await ok('qpdf', [`--show-object=${root}`, file])).stdout;
  const dssNum = /\/DSS (\d+) 0 R/.exec(catalog)?.[1];
  if (!dssNum) return { certs: [], crls: [] };
  const dss = (await ok('qpdf', [`--show-object=${dssNum}`, file])).stdout;
  const refs = (key: string) => [...(new RegExp(`/${key} \\[([^\\]]*)\\]`).exec(dss)?.[1] ?? '').matchAll(/(\d+) 0 R/g)].map((m) => m[1]);
  const save = async (num: string, name: string) => {
    const out = join(dir, name);
    // --raw-stream-data writes the stream's bytes as stored (the DSS streams are not compressed).
    const { stdout } = await tool('sh', ['-c', `qpdf --show-object=${num} --raw-stream-data '${file}' > '${out}'`]);
    void stdout;
    return out;
  };
  return {
    certs: await Promise.all(refs('Certs').map((n, i) => save(n, `dss-cert-${i}.der`))),
    crls: await Promise.all(refs('CRLs').map((n, i) => save(n, `dss-crl-${i}.der`))),
  };
}
