// Downloads are what their bytes are: served with the media type sniffed at upload from an allow-list,
// always as an attachment with nosniff, with the file name kept as typed (RFC 6266 / 5987 encoded);
// authenticated answers are never cached.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flat, pdftext } from '../pdf/poppler';
import { demoDesign } from '../support/fixtures';
import { newDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
let engineer: supertest.Agent;
let draftId: number;
beforeAll(async () => {
  server = await startTestServer();
  ({ engineer, id: draftId } = await newDraft(server, 'Downloads', demoDesign));
});
afterAll(() => server.close());

const binary = (req: supertest.Test) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

async function upload(bytes: Buffer, name: string) {
  const res = await engineer.post(`/api/revisions/${draftId}/evidence`).field('kind', 'other').attach('file', bytes, name);
  expect(res.status, res.text).toBe(201);
  return res.body as { id: number; mediaType: string; originalName: string };
}

// Magic numbers from the formats' specifications (PNG: ISO/IEC 15948 signature; PDF: "%PDF-"; PE: "MZ").
const PNG = Buffer.from([
  0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 6, 0, 0, 0, 0x1f, 0x15, 0xc4, 0x89,
]);
const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
const EXE = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(64, 0), Buffer.from('PE\0\0')]);

describe('media types of downloads', () => {
  it('when files of every sort are uploaded as "other", then each is served as its sniffed type from the allow-list, never as a page or script', async () => {
    const cases: Array<[Buffer, string, string]> = [
      [Buffer.from('<!doctype html><script>alert(document.cookie)</script>'), 'notes.html', 'text/plain'],
      [Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>'), 'logo.svg', 'text/plain'],
      [Buffer.from('fetch("/api/users").then(r => r.json())'), 'tool.js', 'text/plain'],
      [PNG, 'scope.png', 'image/png'],
      [PDF, 'report.pdf', 'application/pdf'],
      [EXE, 'setup.exe', 'application/octet-stream'],
      [Buffer.from([0, 1, 2, 3, 250, 251, 252]), 'blob.bin', 'application/octet-stream'],
    ];
    for (const [bytes, name, type] of cases) {
      const stored = await upload(bytes, name);
      expect(stored.mediaType, name).toBe(type);
      const res = await binary(engineer.get(`/api/evidence/${stored.id}/file`));
      expect(res.status).toBe(200);
      expect(res.headers['content-type'], name).toMatch(new RegExp(`^${type.replace('/', '\\/')}`));
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['content-disposition'], name).toMatch(/^attachment;/);
      expect(res.headers['content-security-policy']).toContain('sandbox');
      expect(Buffer.compare(res.body as Buffer, bytes), name).toBe(0);
    }
  });

  it('when a stored row claims a type outside the allow-list, then it is still served as a byte stream', async () => {
    const stored = await upload(Buffer.from('plain words'), 'legacy.txt');
    await server.ctx.db('evidence').where({ id: stored.id }).update({ media_type: 'text/html' });
    const res = await binary(engineer.get(`/api/evidence/${stored.id}/file`));
    expect(res.headers['content-type']).toBe('application/octet-stream');
  });
});

describe('file names', () => {
  it('when a file named "Prüfbericht Ω.txt" is uploaded, then the name is kept in the record, the audit trail, the download header and the PDF', async () => {
    const stored = await upload(Buffer.from('Prüfprotokoll, Entladung 60 V nach 3,3 s'), 'Prüfbericht Ω.txt');
    expect(stored.originalName).toBe('Prüfbericht Ω.txt');

    const res = await binary(engineer.get(`/api/evidence/${stored.id}/file`));
    // RFC 6266 with an RFC 5987 filename*: UTF-8, percent-encoded; an ASCII stand-in for old clients.
    expect(res.headers['content-disposition']).toBe(`attachment; filename="Prufbericht _.txt"; filename*=UTF-8''Pr%C3%BCfbericht%20%CE%A9.txt`);

    const reviewer = await server.signIn('reviewer');
    const dossierId = (await engineer.get(`/api/revisions/${draftId}`)).body.dossierId;
    const audit = (await reviewer.get(`/api/audit?dossierId=${dossierId}`)).body.events as Array<{ action: string; payload: { name?: string } }>;
    expect(audit.filter((e) => e.action === 'evidence.add').map((e) => e.payload.name)).toContain('Prüfbericht Ω.txt');

    const pdf = await binary(engineer.get(`/api/revisions/${draftId}/dossier.pdf`));
    const dir = mkdtempSync(join(tmpdir(), 'vf-pdf-'));
    try {
      writeFileSync(join(dir, 'draft.pdf'), pdf.body as Buffer);
      expect(flat(await pdftext(join(dir, 'draft.pdf')))).toContain('Prüfbericht Ω.txt');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('when a name carries quotes, semicolons, percent signs or characters outside the BMP, then the header encodes them instead of breaking', async () => {
    const stored = await upload(Buffer.from('x'), 'a"b; d=e 50% 🔌.txt');
    expect(stored.originalName).toBe('a"b; d=e 50% 🔌.txt');
    const res = await binary(engineer.get(`/api/evidence/${stored.id}/file`));
    expect(res.headers['content-disposition']).toBe(
      `attachment; filename="a\\"b; d=e 50% _.txt"; filename*=UTF-8''a%22b%3B%20d%3De%2050%25%20%F0%9F%94%8C.txt`,
    );
  });

  it('when a name carries a path, a line break or a bidirectional override, then those are dropped and the rest kept', async () => {
    expect((await upload(Buffer.from('x'), 'C:\\bench\\scope 01.csv')).originalName).toBe('scope 01.csv');
    // The browser sends the line break as %0A (WHATWG form encoding); it never reaches the record.
    expect((await upload(Buffer.from('x'), 'scope\n\u202Egnp.exe.csv')).originalName).toBe('scopegnp.exe.csv');
  });
});

describe('caching', () => {
  it('when a signed-in user reads the API, then every answer says no-store', async () => {
    const stored = await upload(Buffer.from('cache me not'), 'c.txt');
    for (const path of [
      `/api/revisions/${draftId}`,
      '/api/dossiers',
      `/api/evidence/${stored.id}/file`,
      `/api/revisions/${draftId}/dossier.pdf`,
      '/api/auth/me',
    ]) {
      const res = await binary(engineer.get(path));
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toBe('no-store');
    }
  });
});
