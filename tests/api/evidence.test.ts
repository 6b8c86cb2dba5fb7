import { request as httpRequest } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  // Small limits so "over the limit" is cheap to test; the logic is the same at 512 MB.
  server = await startTestServer({}, { UPLOAD_LIMIT_WAVEFORM_MB: '2', UPLOAD_LIMIT_OTHER_MB: '0.5' });
});
afterAll(() => server.close());

/** An RC decay V0·e^(−t/τ) after a pre-trigger plateau (common practice: the shape of a bleeder discharge). */
function capture(v0: number, tau: number, seconds: number, rows = 4000): string {
  const lines = ['Record length,4000', 'Sample interval,' + (seconds / rows).toExponential(6), 'Time (s),CH1 (V)'];
  for (let i = 0; i < rows; i++) {
    const t = -0.1 * seconds + (i * 1.1 * seconds) / rows;
    lines.push(`${t.toExponential(6)},${(t < 0 ? v0 : v0 * Math.exp(-t / tau)).toExponential(6)}`);
  }
  return lines.join('\n') + '\n';
}

async function draft(title: string) {
  const engineer = await server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const id = dossier.revisions[0].id as number;
  await saveDraft(engineer, id, { design: demoDesign });
  return { engineer, id };
}

const evidenceFiles = () => server.storedFiles('evidence');
const tmpFiles = () => server.stagingFiles('evidence');

describe('evidence uploads', () => {
  it('when a capture is uploaded to a draft, then it is analysed and a measured check joins the verdict', async () => {
    const { engineer, id } = await draft('Capture story');
    // τ = 1.5 s from 622 V: 60 V is reached at 1.5·ln(622/60) = 3.508 s (V0·e^(−t/τ), common practice).
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(622, 1.5, 8)), 'bench-01.csv');
    expect(res.status).toBe(201);
    expect(res.body.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(res.body.mediaType).toBe('text/csv');
    expect(res.body.analysis.timeToSafe).toBeCloseTo(1.5 * Math.log(622 / 60), 1);
    expect(res.body.analysis.tau).toBeCloseTo(1.5, 1);
    const rev = (await engineer.get(`/api/revisions/${id}`)).body;
    const measured = rev.results.checks.find((c: { id: string }) => c.id === `measured-discharge:${res.body.sha256.slice(0, 12)}`);
    expect(measured).toBeTruthy();
    expect(measured.pass).toBe(true);
    expect(await evidenceFiles()).toContain(res.body.sha256);
  });

  it('when the engineer names the voltage and marker channels, then those are the ones analysed', async () => {
    const { engineer, id } = await draft('Two channels');
    // CH1 is a relay marker (0 V before, 5 V after the disconnect at t = 0.2 s); CH2 the bus, τ = 0.8 s.
    const rows = ['Time (s),Relay (V),Bus (V)'];
    for (let i = 0; i < 3000; i++) {
      const t = i * 0.002;
      rows.push(`${t.toFixed(4)},${t < 0.2 ? 0 : 5},${(t < 0.2 ? 500 : 500 * Math.exp(-(t - 0.2) / 0.8)).toFixed(3)}`);
    }
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .field('channel', 'Bus')
      .field('markerChannel', '0')
      .attach('file', Buffer.from(rows.join('\n')), 'two-channels.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.channel).toBe('Bus (V)');
    expect(res.body.analysis.t0Source).toBe('marker');
    expect(res.body.analysis.t0).toBeCloseTo(0.2, 2);
    expect(res.body.analysis.tau).toBeCloseTo(0.8, 2);
    const missing = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .field('channel', 'CH9')
      .attach('file', Buffer.from(rows.join('\n')), 'x.csv');
    expect(missing.status).toBe(422);
    expect(missing.body.error.message).toMatch(/CH9/);
  });

  it('when a capture never reaches the safe voltage, then it is stored as a failing measurement, not an error', async () => {
    const { engineer, id } = await draft('Slow capture');
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(622, 50, 8)), 'slow.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.timeToSafe).toBeNull();
    const rev = (await engineer.get(`/api/revisions/${id}`)).body;
    expect(rev.results.verdict).toBe('fails');
    expect(rev.results.checks.find((c: { id: string }) => c.id === `measured-discharge:${res.body.sha256.slice(0, 12)}`).pass).toBe(false);
  });

  it('when the same file is uploaded twice, then its bytes are stored once', async () => {
    const { engineer, id } = await draft('Twice');
    const body = Buffer.from(capture(400, 0.7, 5));
    const a = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', body, 'a.csv');
    const b = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', body, 'b.csv');
    expect(a.body.sha256).toBe(b.body.sha256);
    expect((await evidenceFiles()).filter((f) => f === a.body.sha256)).toHaveLength(1);
  });

  it('when bad files arrive, then each gets a clear message and nothing is left behind', async () => {
    const { engineer, id } = await draft('Bad files');
    const before = (await evidenceFiles()).length;
    const cases: Array<[string, Buffer, string, number, RegExp]> = [
      ['waveform', Buffer.alloc(0), 'empty.csv', 422, /empty/i],
      [
        'waveform',
        Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]),
        'renamed.csv',
        422,
        /not a text capture/,
      ],
      ['waveform', Buffer.from('name,comment\nfoo,bar\nbaz,qux\n'), 'words.csv', 422, /.+/],
      ['waveform', Buffer.from('t,v\n0,600\n0.2,400\n0.1,300\n0.3,200\n0.4,100\n'), 'backwards.csv', 422, /.+/],
      ['image', Buffer.from('just text'), 'photo.jpg', 422, /not a PNG or JPEG/],
      ['report', Buffer.from('%PDX not really'), 'report.pdf', 422, /not a PDF/],
    ];
    for (const [kind, bytes, name, status, message] of cases) {
      const res = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', kind).attach('file', bytes, name);
      expect(res.status, name).toBe(status);
      expect(res.body.error.message, name).toMatch(message);
    }
    const rev = (await engineer.get(`/api/revisions/${id}`)).body;
    expect(rev.evidence).toHaveLength(0);
    expect((await evidenceFiles()).length).toBe(before);
    expect(tmpFiles()).toEqual([]);
  });

  it('when a UTF-16 capture (as Windows tools write it) is uploaded, then it is decoded and analysed like its UTF-8 twin', async () => {
    const { engineer, id } = await draft('UTF-16 capture');
    // τ = 1.5 s from 622 V: 60 V after 1.5·ln(622/60) = 3.508 s (V0·e^(−t/τ), common practice).
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(capture(622, 1.5, 8), 'utf16le')]);
    const res = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', utf16, 'bench-utf16.csv');
    expect(res.status).toBe(201);
    expect(res.body.mediaType).toBe('text/csv');
    expect(res.body.analysis.encoding).toBe('utf-16le');
    expect(Math.abs(res.body.analysis.timeToSafe - 1.5 * Math.log(622 / 60))).toBeLessThan(0.01 * 3.508);
    expect(Math.abs(res.body.analysis.tau - 1.5)).toBeLessThan(0.015);
    const twin = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(622, 1.5, 8)), 'bench-utf8.csv');
    expect(twin.body.analysis.timeToSafe).toBe(res.body.analysis.timeToSafe);
    const file = await engineer
      .get(`/api/evidence/${res.body.id}/file`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(Buffer.compare(file.body as Buffer, utf16)).toBe(0);
  });

  it('when a binary export is uploaded as a capture, then 422 on the file field names the text formats to export instead', async () => {
    const { engineer, id } = await draft('Binary exports');
    const before = (await evidenceFiles()).length;
    const record = Buffer.from(new Float32Array(4096).map((_, i) => 400 * Math.exp(-(i + 1) / 900) + (i % 7) * 0.01).buffer);
    const cases: Array<[string, Buffer]> = [
      // A header with NUL padding, then float samples: what a binary scope record looks like.
      ['scope.bin', Buffer.concat([Buffer.from('WFM1\0\0\0\0', 'latin1'), record])],
      // The same record behind a UTF-16 byte-order mark: the mark alone does not make it text.
      ['marked.csv', Buffer.concat([Buffer.from([0xff, 0xfe]), record])],
    ];
    for (const [name, bytes] of cases) {
      const res = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', bytes, name);
      expect(res.status, name).toBe(422);
      expect(res.body.error.code, name).toBe('wrong_content');
      expect(res.body.error.message, name).toMatch(
        /Export the capture from the instrument as CSV \(comma or semicolon separated\), TSV \(tab separated\) or TXT/,
      );
      expect(
        res.body.error.fields.map((f: { path: string }) => f.path),
        name,
      ).toEqual(['file']);
    }
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(0);
    expect((await evidenceFiles()).length).toBe(before);
    expect(tmpFiles()).toEqual([]);
  });

  it('when a capture holds probe-side volts, then the voltage scale entered with it is applied and recorded', async () => {
    const { engineer, id } = await draft('Scaled capture');
    // 6.22 V in the file behind a 100:1 probe the instrument did not account for: 622 V at the bus.
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .field('scale', '100')
      .attach('file', Buffer.from(capture(6.22, 1.5, 8)), 'probe-side.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.scale).toBe(100);
    expect(Math.abs(res.body.analysis.v0 - 622)).toBeLessThan(6.22);
    expect(Math.abs(res.body.analysis.timeToSafe - 1.5 * Math.log(622 / 60))).toBeLessThan(0.01 * 3.508);
    for (const scale of ['abc', '0', '-10']) {
      const bad = await engineer
        .post(`/api/revisions/${id}/evidence`)
        .field('kind', 'waveform')
        .field('scale', scale)
        .attach('file', Buffer.from(capture(6.22, 1.5, 8)), 'x.csv');
      expect(bad.status, scale).toBe(400);
      expect(
        bad.body.error.fields.map((f: { path: string }) => f.path),
        scale,
      ).toEqual(['scale']);
    }
  });

  it('when a negative-rail capture is slower than the limit, then the measured check fails instead of reading safe at once', async () => {
    const { engineer, id } = await draft('Negative rail');
    // −622 V with τ = 3 s: |v| reaches 60 V after 3·ln(622/60) = 7.02 s, beyond the demo's time limit.
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(-622, 3, 9)), 'dc-minus.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.polarity).toBe('negative');
    expect(Math.abs(res.body.analysis.timeToSafe - 3 * Math.log(622 / 60))).toBeLessThan(0.01 * 7.02);
    const rev = (await engineer.get(`/api/revisions/${id}`)).body;
    const measured = rev.results.checks.find((c: { id: string }) => c.id.startsWith('measured-discharge'));
    expect(measured.pass).toBe(false);
    expect(rev.results.verdict).toBe('fails');
  });

  it("when a file is over its kind's limit, then 413 and nothing is kept", async () => {
    const { engineer, id } = await draft('Too big');
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'other')
      .attach('file', Buffer.alloc(700 * 1024, 65), 'big.txt');
    expect(res.status).toBe(413);
    const huge = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.alloc(3 * 1024 * 1024, 65), 'huge.csv');
    expect(huge.status).toBe(413);
    expect(tmpFiles()).toEqual([]);
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(0);
  });

  it('when a client declares a 2 GB upload, then it is refused before the body is read and the server stays healthy', async () => {
    const { id } = await draft('Two gigabytes');
    const signIn = await server.anonymous().post('/api/auth/sign-in').send({ email: 'engineer@fennel.test', password: 'voltfall-demo' });
    const jar = String(signIn.headers['set-cookie']).split(';')[0];
    const status = await new Promise<number>((resolve, reject) => {
      const req = httpRequest(`${server.url}/api/revisions/${id}/evidence`, {
        method: 'POST',
        headers: { 'Content-Type': 'multipart/form-data; boundary=x', 'Content-Length': String(2 * 1024 ** 3), Origin: server.url, Cookie: jar },
      });
      req.on('response', (res) => resolve(res.statusCode ?? 0));
      req.on('error', reject);
      req.write(Buffer.alloc(64 * 1024));
    });
    expect(status).toBe(413);
    expect((await server.anonymous().get('/api/health')).body).toEqual({ ok: true });
  });

  it('when a revision is submitted, then evidence can be neither added nor removed', async () => {
    const { engineer, id } = await draft('Frozen evidence');
    const up = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(622, 1.2, 6)), 'x.csv');
    await engineer.post(`/api/revisions/${id}/submit`);
    const add = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(capture(622, 1.1, 6)), 'y.csv');
    expect(add.status).toBe(409);
    const del = await engineer.delete(`/api/evidence/${up.body.id}`);
    expect(del.status).toBe(409);
  });

  it('when evidence is downloaded, then the stored bytes come back with the sniffed type', async () => {
    const { engineer, id } = await draft('Download');
    const text = capture(300, 0.4, 3);
    const up = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', Buffer.from(text), '../../etc/evil name.csv');
    expect(up.body.originalName).toBe('evil name.csv');
    // A draft's evidence is for the team (a viewer gets 404 until the revision is approved).
    const reviewer = await server.signIn('reviewer');
    const file = await reviewer
      .get(`/api/evidence/${up.body.id}/file`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(file.status).toBe(200);
    expect((file.body as Buffer).toString()).toBe(text);
  });
});
