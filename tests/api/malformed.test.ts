// Malformed requests get a 4xx with the error shape, never a 500: broken multipart forms, JSON nested
// without bound or with the wrong types, ids that are not plain decimal numbers.
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign } from '../support/fixtures';
import { newDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
let engineer: supertest.Agent;
let draftId: number;
beforeAll(async () => {
  server = await startTestServer();
  ({ engineer, id: draftId } = await newDraft(server, 'Malformed requests', demoDesign));
});
afterAll(() => server.close());

const BOUNDARY = 'vf-boundary-7d3a';
const part = (name: string, value: string, filename?: string) =>
  `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${name}"${filename ? `; filename="${filename}"\r\nContent-Type: text/plain` : ''}\r\n\r\n${value}\r\n`;

function expectErrorShape(res: supertest.Response, status: number, code?: string) {
  expect(res.status, res.text.slice(0, 300)).toBe(status);
  expect(res.body.error.message).toEqual(expect.any(String));
  if (code) expect(res.body.error.code).toBe(code);
}

describe('multipart uploads that are not complete forms', () => {
  const post = () => engineer.post(`/api/revisions/${draftId}/evidence`);

  it('when the multipart content type has no boundary, then 400', async () => {
    const res = await post()
      .set('Content-Type', 'multipart/form-data')
      .send(Buffer.from(part('kind', 'other')));
    expectErrorShape(res, 400, 'invalid_upload');
  });

  it('when the form is cut off in the middle of the file, then 400 and no temporary file is left', async () => {
    const cut = `${part('kind', 'other')}--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="log.txt"\r\nContent-Type: text/plain\r\n\r\nthe first half of the`;
    const res = await post().set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`).send(Buffer.from(cut));
    expectErrorShape(res, 400, 'invalid_upload');
    expect(res.body.error.message).toMatch(/not a complete multipart form/);
    expect(await server.housekeeping.sweep(false)).toMatchObject({ tempFiles: 0 });
  });

  it('when the part headers are garbage, then 400', async () => {
    const res = await post()
      .set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`)
      .send(Buffer.from(`--${BOUNDARY}\r\n\u0000\u0001 not a header\r\n\r\nx\r\n--${BOUNDARY}--\r\n`));
    expect(res.status).toBe(400);
  });

  it('when the file part is missing, then 400 naming "file"', async () => {
    const res = await post().field('kind', 'other');
    expectErrorShape(res, 400);
    expect(res.body.error.fields).toEqual([{ path: 'file', message: 'missing' }]);
  });

  it('when two files arrive, or a file under another name, then 400 and neither is kept', async () => {
    const two = await post().field('kind', 'other').attach('file', Buffer.from('one'), 'one.txt').attach('file', Buffer.from('two'), 'two.txt');
    expectErrorShape(two, 400, 'invalid_upload');
    const elsewhere = await post().field('kind', 'other').attach('attachment', Buffer.from('three'), 'three.txt');
    expectErrorShape(elsewhere, 400, 'invalid_upload');
    expect((await engineer.get(`/api/revisions/${draftId}`)).body.evidence).toEqual([]);
  });
});

describe('JSON bodies', () => {
  const nested = (depth: number) => '['.repeat(depth) + ']'.repeat(depth);

  it('when JSON nests deeper than 32 levels, then 400 too_deep before anything walks it, however deep', async () => {
    for (const depth of [33, 1_000, 1_000_000]) {
      const res = await engineer
        .post('/api/calc/discharge')
        .set('Content-Type', 'application/json')
        .send(`{"design":${nested(depth)}}`);
      expectErrorShape(res, 400, 'too_deep');
    }
    // 32 levels are parsed and judged by the schema instead.
    const shallow = await engineer
      .post('/api/calc/discharge')
      .set('Content-Type', 'application/json')
      .send(`{"design":${nested(31)}}`);
    expectErrorShape(shallow, 400, 'invalid_input');
    // Brackets inside strings are text, not nesting.
    const inString = await engineer
      .patch(`/api/revisions/${draftId}`)
      .send({ version: (await engineer.get(`/api/revisions/${draftId}`)).body.version, notes: `[[{${'['.repeat(100)}` });
    expect(inString.status).toBe(200);
  });

  it('when the sign-in e-mail or password is not a string, then 400 names the field', async () => {
    for (const email of [12, ['engineer@fennel.test'], { $gt: '' }, null, true]) {
      const res = await server.anonymous().post('/api/auth/sign-in').send({ email, password: 'voltfall-demo' });
      expectErrorShape(res, 400, 'invalid_input');
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('email');
    }
    const res = await server
      .anonymous()
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@fennel.test', password: { toString: 'voltfall-demo' } });
    expectErrorShape(res, 400, 'invalid_input');
  });

  it('when the body is not JSON, not UTF-8 or not an object, then 4xx with the error shape', async () => {
    expectErrorShape(await engineer.post('/api/calc/discharge').set('Content-Type', 'application/json').send('{"design":'), 400, 'malformed_json');
    expectErrorShape(
      await engineer.post('/api/calc/discharge').set('Content-Type', 'application/json').send('"just a string"'),
      400,
      'malformed_json',
    );
    const latin1 = await engineer.post('/api/calc/discharge').set('Content-Type', 'application/json; charset=latin1').send('{}');
    expect(latin1.status).toBe(415);
    expectErrorShape(await engineer.post('/api/products').send([{ name: 'x' }]), 400, 'invalid_input');
  });
});

describe('ids in the address', () => {
  it('when an id is not plain decimal digits, then 400 (it never resolves to another record)', async () => {
    for (const id of ['0x10', '%201', '1%20', '1.0', '1e0', '01', '-1', '+1', '0', '1_0', '９', '99999999999999999999']) {
      const res = await engineer.get(`/api/revisions/${id}`);
      expectErrorShape(res, 400, 'invalid_input');
      expect(res.body.error.fields[0].path, id).toBe('id');
    }
    expect((await engineer.get(`/api/revisions/${draftId}`)).status).toBe(200);
  });

  it('when a query id is not plain decimal digits or is given twice, then 400 naming it', async () => {
    const reviewer = await server.signIn('reviewer');
    for (const q of ['dossierId=0x1', 'dossierId=1e0', 'dossierId=1&dossierId=2', 'dossierId=%201']) {
      const res = await reviewer.get(`/api/audit?${q}`);
      expectErrorShape(res, 400, 'invalid_input');
      expect(res.body.error.fields[0].path, q).toBe('dossierId');
    }
    const diff = await engineer.get(`/api/revisions/${draftId}/diff?against=1.0`);
    expectErrorShape(diff, 400, 'invalid_input');
  });
});
