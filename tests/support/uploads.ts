// An upload as a slow client sends it: a real multipart body written over a raw HTTP connection in
// chunks, so a test can cut it off (client gone, server stopped or killed) part-way through.
import { request as httpRequest, type ClientRequest, type IncomingMessage } from 'node:http';
import { DEMO_PASSWORD } from '../../server/db/seed';

/** Signs in over plain HTTP (works for in-process and spawned servers) and returns the session cookie. */
export async function sessionCookie(baseUrl: string, email: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: baseUrl },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

export interface SlowUpload {
  req: ClientRequest;
  /** Bytes of the file part written so far. */
  sent(): number;
  /** Data rows (samples) of the capture written so far. */
  rows(): number;
  /** Writes up to `bytes` more of the capture (resolves when the socket has taken them). */
  send(bytes: number): Promise<void>;
  /** Writes the rest of the declared size and the closing boundary; resolves with the answer. */
  finish(): Promise<{ status: number; body: string }>;
  response: Promise<IncomingMessage>;
}

const BOUNDARY = 'vf-slow-upload-boundary';

const LINE_BYTES = 24;

/**
 * `bytes` of a scope capture of an RC decay (common practice: 600 V, τ = 1.5 s, 1 µs sampling) from
 * line `first` on; every line is 24 bytes ("d.dddddde±d,d.dddddde±d\n"), the remainder blank lines.
 */
function captureChunk(first: number, bytes: number): Buffer {
  const lines: string[] = [];
  for (let i = first; i < first + Math.floor(bytes / LINE_BYTES); i++) {
    const t = i * 1e-6;
    lines.push(`${t.toExponential(6)},${(600 * Math.exp(-t / 1.5)).toExponential(6)}\n`);
  }
  return Buffer.from(lines.join('') + '\n'.repeat(bytes % LINE_BYTES));
}

/** Opens a waveform upload of `fileBytes` to a draft and sends nothing of the file yet. */
export function startSlowUpload(
  baseUrl: string,
  revisionId: number,
  cookie: string,
  fileBytes: number,
  fields: Record<string, string> = {},
): SlowUpload {
  const head = Buffer.from(
    [
      ...Object.entries({ kind: 'waveform', ...fields }).map(
        ([k, v]) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`,
      ),
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="long-capture.csv"\r\nContent-Type: text/csv\r\n\r\n`,
    ].join(''),
  );
  const header = Buffer.from('Time (s),CH1 (V)\n');
  const tail = Buffer.from(`\r\n--${BOUNDARY}--\r\n`);
  const req = httpRequest(`${baseUrl}/api/revisions/${revisionId}/evidence`, {
    method: 'POST',
    headers: {
      'Content-Type': `multipart/form-data; boundary=${BOUNDARY}`,
      'Content-Length': String(head.length + fileBytes + tail.length),
      Origin: baseUrl,
      Cookie: cookie,
    },
  });
  // A cut-off connection is what these tests are about; its error is expected.
  req.on('error', () => undefined);
  const response = new Promise<IncomingMessage>((resolve) => req.on('response', resolve));
  req.write(head);
  req.write(header);
  let sent = header.length;
  let line = 0;
  const write = (chunk: Buffer) => new Promise<void>((resolve) => (req.write(chunk) ? resolve() : req.once('drain', () => resolve())));
  const send = async (bytes: number) => {
    const size = Math.min(bytes, fileBytes - sent);
    if (size <= 0) return;
    await write(captureChunk(line, size));
    line += Math.floor(size / LINE_BYTES);
    sent += size;
  };
  return {
    req,
    sent: () => sent,
    rows: () => line,
    send,
    response,
    async finish() {
      while (sent < fileBytes) await send(1024 * 1024);
      req.end(tail);
      const res = await response;
      let body = '';
      for await (const chunk of res) body += chunk;
      return { status: res.statusCode ?? 0, body };
    },
  };
}
