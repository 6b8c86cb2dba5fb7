// Role × route → expected status, for every route of the API. A new route gets a row here.
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft, startTestServer, type DemoRole, type TestServer } from '../support/test-server';

type Who = 'anonymous' | 'admin' | 'engineer' | 'reviewer' | 'viewer';
const WHO: Who[] = ['anonymous', 'admin', 'engineer', 'reviewer', 'viewer'];

interface Row {
  method: 'get' | 'post' | 'patch' | 'delete';
  path: (ids: Ids) => string;
  body?: unknown;
  /** Expected status per caller; `signedIn` fills the roles not named. */
  expect: Partial<Record<Who | 'signedIn', number>>;
}

interface Ids {
  productId: number;
  dossierId: number;
  draftId: number;
  inReviewId: number;
  evidenceId: number;
  /** Revision 1 of its dossier, approved, with evidence; revision 2 is a draft copied from it. */
  approvedId: number;
  approvedEvidenceId: number;
  approvedDossierId: number;
  copiedDraftId: number;
  userId: string;
}

// Bodies are deliberately invalid where the route takes one: a caller who passes the guard gets
// 400 from validation, so the table shows who gets past the role check without changing data.
// Viewers see approved work only: everything else answers them 404 (need-to-know).
const TABLE: Row[] = [
  { method: 'get', path: () => '/api/health', expect: { anonymous: 200, signedIn: 200 } },
  { method: 'get', path: () => '/api/auth/me', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: () => '/api/auth/session', expect: { anonymous: 200, signedIn: 200 } },
  { method: 'post', path: () => '/api/auth/sign-in', body: {}, expect: { anonymous: 400, signedIn: 400 } },
  { method: 'get', path: () => '/api/auth/invite?token=short', expect: { anonymous: 400, signedIn: 400 } },
  { method: 'post', path: () => '/api/auth/set-password', body: {}, expect: { anonymous: 400, signedIn: 400 } },
  { method: 'post', path: () => '/api/auth/forgot-password', body: {}, expect: { anonymous: 400, signedIn: 400 } },
  { method: 'get', path: () => '/api/users', expect: { anonymous: 401, admin: 200, signedIn: 403 } },
  { method: 'post', path: () => '/api/users', body: {}, expect: { anonymous: 401, admin: 400, signedIn: 403 } },
  { method: 'patch', path: (i) => `/api/users/${i.userId}`, body: {}, expect: { anonymous: 401, admin: 400, signedIn: 403 } },
  // The viewer's account has a password already: the admin passes the guard and is told why not (409).
  { method: 'post', path: (i) => `/api/users/${i.userId}/invite`, expect: { anonymous: 401, admin: 409, signedIn: 403 } },
  { method: 'delete', path: (i) => `/api/users/${i.userId}/invite`, expect: { anonymous: 401, admin: 409, signedIn: 403 } },
  { method: 'get', path: () => '/api/outbox', expect: { anonymous: 401, admin: 200, signedIn: 403 } },
  { method: 'post', path: () => '/api/calc/discharge', body: {}, expect: { anonymous: 401, signedIn: 400 } },
  { method: 'post', path: () => '/api/calc/snubber', body: {}, expect: { anonymous: 401, signedIn: 400 } },
  { method: 'get', path: () => '/api/products', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'post', path: () => '/api/products', body: {}, expect: { anonymous: 401, admin: 400, engineer: 400, signedIn: 403 } },
  { method: 'get', path: (i) => `/api/products/${i.productId}`, expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: () => '/api/dossiers', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'post', path: () => '/api/dossiers', body: {}, expect: { anonymous: 401, admin: 400, engineer: 400, signedIn: 403 } },
  { method: 'get', path: (i) => `/api/dossiers/${i.dossierId}`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/dossiers/${i.approvedDossierId}`, expect: { anonymous: 401, signedIn: 200 } },
  {
    method: 'post',
    path: (i) => `/api/dossiers/${i.dossierId}/revisions`,
    body: { fromRevisionId: 'x' },
    expect: { anonymous: 401, admin: 400, engineer: 400, signedIn: 403 },
  },
  { method: 'get', path: (i) => `/api/revisions/${i.draftId}`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/revisions/${i.inReviewId}`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/revisions/${i.approvedId}`, expect: { anonymous: 401, signedIn: 200 } },
  // A version but neither design nor notes: past the guard, refused by validation (without a version: 428).
  {
    method: 'patch',
    path: (i) => `/api/revisions/${i.draftId}`,
    body: { version: 1 },
    expect: { anonymous: 401, admin: 400, engineer: 400, signedIn: 403 },
  },
  // Authored by engineer2: the engineer and admin pass the role guard but are not the author.
  { method: 'post', path: (i) => `/api/revisions/${i.inReviewId}/submit`, expect: { anonymous: 401, admin: 403, engineer: 403, signedIn: 403 } },
  { method: 'get', path: (i) => `/api/revisions/${i.draftId}/diff`, expect: { anonymous: 401, signedIn: 404 } },
  { method: 'get', path: (i) => `/api/revisions/${i.copiedDraftId}/diff`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'post', path: (i) => `/api/revisions/${i.inReviewId}/decision`, body: {}, expect: { anonymous: 401, reviewer: 400, signedIn: 403 } },
  // Approving is a signature: without the password the reviewer is refused (401), before anything changes.
  {
    method: 'post',
    path: (i) => `/api/revisions/${i.inReviewId}/decision`,
    body: { decision: 'approve' },
    expect: { anonymous: 401, reviewer: 401, signedIn: 403 },
  },
  { method: 'post', path: (i) => `/api/revisions/${i.inReviewId}/comments`, body: {}, expect: { anonymous: 401, viewer: 403, signedIn: 400 } },
  { method: 'get', path: () => '/api/reviews', expect: { anonymous: 401, admin: 200, reviewer: 200, signedIn: 403 } },
  { method: 'get', path: (i) => `/api/audit?dossierId=${i.dossierId}`, expect: { anonymous: 401, admin: 200, reviewer: 200, signedIn: 403 } },
  { method: 'get', path: () => '/api/overview', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: () => '/api/overview/myDrafts?limit=5', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: () => '/api/dossiers?limit=201', expect: { anonymous: 401, signedIn: 400 } },
  // The draft is engineer2's: the engineer is refused as not the author, the admin reaches validation.
  { method: 'post', path: (i) => `/api/revisions/${i.draftId}/evidence`, expect: { anonymous: 401, admin: 400, engineer: 403, signedIn: 403 } },
  { method: 'get', path: (i) => `/api/evidence/${i.evidenceId}/file`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/evidence/${i.approvedEvidenceId}/file`, expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/revisions/${i.inReviewId}/dossier.pdf`, expect: { anonymous: 401, viewer: 404, signedIn: 200 } },
  { method: 'get', path: (i) => `/api/revisions/${i.approvedId}/dossier.pdf`, expect: { anonymous: 401, signedIn: 200 } },
  { method: 'delete', path: () => '/api/evidence/999999', expect: { anonymous: 401, admin: 404, engineer: 404, signedIn: 403 } },
  { method: 'get', path: () => '/api/signing/trust', expect: { anonymous: 401, signedIn: 200 } },
  { method: 'get', path: () => '/api/no-such-route', expect: { anonymous: 404, signedIn: 404 } },
];

let server: TestServer;
let ids: Ids;
const agents = new Map<Who, supertest.Agent>();

beforeAll(async () => {
  server = await startTestServer();
  agents.set('anonymous', server.anonymous());
  for (const role of WHO.filter((w) => w !== 'anonymous')) agents.set(role, await server.signIn(role as DemoRole));
  const author = await server.signIn('engineer2');
  const productId = (await author.get('/api/products')).body[0].id;
  const dossier = (await author.post('/api/dossiers').send({ productId, title: 'Access table', requirement: demoRequirement })).body;
  const first = dossier.revisions[0].id;
  await saveDraft(author, first, { design: demoDesign });
  await author.post(`/api/revisions/${first}/submit`);
  const other = (await author.post('/api/dossiers').send({ productId, title: 'Access table draft', requirement: demoRequirement })).body;
  const users = (await agents.get('admin')!.get('/api/users')).body as Array<{ id: string; email: string }>;
  const evidence = await author
    .post(`/api/revisions/${other.revisions[0].id}/evidence`)
    .field('kind', 'other')
    .attach('file', Buffer.from('bench log'), 'log.txt');

  const signed = (await author.post('/api/dossiers').send({ productId, title: 'Access table approved', requirement: demoRequirement })).body;
  const approvedId = signed.revisions[0].id;
  await saveDraft(author, approvedId, { design: demoDesign });
  const approvedEvidence = await author
    .post(`/api/revisions/${approvedId}/evidence`)
    .field('kind', 'other')
    .attach('file', Buffer.from('test report'), 'report.txt');
  await author.post(`/api/revisions/${approvedId}/submit`);
  const approval = await agents
    .get('reviewer')!
    .post(`/api/revisions/${approvedId}/decision`)
    .send({ decision: 'approve', comment: 'ok', password: DEMO_PASSWORD });
  if (approval.status !== 200) throw new Error(`approval failed: ${approval.status} ${JSON.stringify(approval.body)}`);
  const copied = await author.post(`/api/dossiers/${signed.id}/revisions`).send({ fromRevisionId: approvedId });
  ids = {
    productId,
    dossierId: dossier.id,
    draftId: other.revisions[0].id,
    inReviewId: first,
    evidenceId: evidence.body.id,
    approvedId,
    approvedEvidenceId: approvedEvidence.body.id,
    approvedDossierId: signed.id,
    copiedDraftId: copied.body.id,
    userId: users.find((u) => u.email === 'viewer@fennel.test')!.id,
  };
});
afterAll(() => server.close());

describe('access control table', () => {
  for (const row of TABLE) {
    const placeholders = {
      productId: 1,
      dossierId: 1,
      draftId: 1,
      inReviewId: 2,
      evidenceId: 1,
      approvedId: 3,
      approvedEvidenceId: 2,
      approvedDossierId: 3,
      copiedDraftId: 4,
      userId: ':id',
    };
    const label = `${row.method.toUpperCase()} ${row.path(placeholders)}${row.body === undefined ? '' : ` ${JSON.stringify(row.body)}`}`;
    it(label, async () => {
      const got: Record<string, number> = {};
      const want: Record<string, number> = {};
      for (const who of WHO) {
        const expected = row.expect[who] ?? row.expect.signedIn;
        if (expected === undefined) throw new Error(`table row ${label} has no expectation for ${who}`);
        let req = agents.get(who)![row.method](row.path(ids));
        if (row.body !== undefined) req = req.send(row.body as object);
        got[who] = (await req).status;
        want[who] = expected;
      }
      expect(got).toEqual(want);
    });
  }

  it('POST /api/auth/sign-out: anonymous 401, any signed-in role 200', async () => {
    expect((await server.anonymous().post('/api/auth/sign-out')).status).toBe(401);
    for (const role of ['admin', 'engineer', 'reviewer', 'viewer'] as const) {
      const agent = await server.signIn(role);
      expect((await agent.post('/api/auth/sign-out')).status).toBe(200);
    }
  });
});
