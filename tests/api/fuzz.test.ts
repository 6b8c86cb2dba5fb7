// Generated bad requests (fast-check) over every route of the API — path, query and body, JSON and
// multipart, signed in as each role or not at all — against the real in-process app. None may answer
// 5xx or show a stack trace or SQL, and the server must be healthy and consistent afterwards.
import Database from 'better-sqlite3';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ALL_DESIGN_FIELDS } from '../../shared/schema/fields';
import { demoDesign } from '../support/fixtures';
import { DEMO_PASSWORD, newDraft, startTestServer, TEST_BACKEND, type TestServer } from '../support/test-server';
import { sessionCookie } from '../support/uploads';

const BATCHES = 200;
const BATCH_SIZE = 52;

let server: TestServer;
const cookies: Record<string, string> = {};
let ids: {
  draft: number;
  draftVersion: () => Promise<number>;
  inReview: number;
  approved: number;
  evidence: number;
  dossier: number;
  product: number;
  viewerUser: string;
};

beforeAll(async () => {
  server = await startTestServer();
  for (const role of ['engineer', 'reviewer', 'admin', 'viewer'] as const) cookies[role] = await sessionCookie(server.url, `${role}@fennel.test`);
  const { engineer, id, dossierId } = await newDraft(server, 'Fuzzed draft', demoDesign);
  const evidence = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'other').attach('file', Buffer.from('bench log'), 'log.txt');
  const rows = await server.ctx.db('revision').select('id', 'status');
  const users = await server.ctx.db('user').select('id', 'email');
  ids = {
    draft: id,
    draftVersion: async () => (await server.ctx.db('revision').where({ id }).first('version')).version,
    inReview: rows.find((r) => r.status === 'in_review')!.id,
    approved: rows.find((r) => r.status === 'approved')!.id,
    evidence: evidence.body.id,
    dossier: dossierId,
    product: (await server.ctx.db('product').first('id')).id,
    viewerUser: users.find((u) => u.email === 'viewer@fennel.test')!.id,
  };
});
afterAll(() => server.close());

// ── Building blocks ────────────────────────────────────────────────────────────────────────────────

const weirdStrings = fc.constantFrom(
  '',
  ' ',
  '0x10',
  ' 1',
  '1.0',
  '1e0',
  '-1',
  '01',
  '+1',
  '９',
  'null',
  'undefined',
  'NaN',
  'Infinity',
  '__proto__',
  'constructor',
  "'; DROP TABLE revision; --",
  '<script>',
  '%00',
  '\u0000',
  '\u202e',
  '💥',
  'a'.repeat(5000),
  '1'.repeat(40),
);
const anyString = fc.oneof(fc.string({ maxLength: 40 }), fc.string({ unit: 'grapheme', maxLength: 20 }), weirdStrings);
const edgeNumbers = fc.constantFrom(
  0,
  -0,
  1,
  -1,
  0.5,
  0.999,
  1.5,
  5e-324,
  1e-300,
  1e300,
  1.7976931348623157e308,
  -1e308,
  2 ** 53,
  2 ** 53 + 2,
  1000,
  1e6,
  1e12,
  -273.15,
);
const anyNumber = fc.oneof(edgeNumbers, fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer());
const scalar = fc.oneof(anyNumber, anyString, fc.boolean(), fc.constant(null));
const anyJson = fc.oneof(
  { weight: 3, arbitrary: scalar },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 4 }) },
  fc.array(scalar, { maxLength: 5 }),
  fc.dictionary(anyString, scalar, { maxKeys: 5 }),
);

/** A value that is sometimes right for a field and mostly wrong. */
const fieldValue = (good: fc.Arbitrary<unknown>) => fc.oneof({ weight: 2, arbitrary: good }, { weight: 3, arbitrary: anyJson });

const setPath = (obj: Record<string, unknown>, path: string, value: unknown) => {
  const keys = path.split('.');
  let at = obj;
  for (const k of keys.slice(0, -1)) at = (at[k] && typeof at[k] === 'object' ? at[k] : (at[k] = {})) as Record<string, unknown>;
  at[keys[keys.length - 1]] = value;
  return obj;
};

/** A design draft: known fields set to edge values, wrong types or left out, plus stray keys and snubbers. */
const design = fc
  .tuple(
    fc.subarray(
      ALL_DESIGN_FIELDS.map((f) => f.path),
      { maxLength: 12 },
    ),
    fc.array(fieldValue(anyNumber), { minLength: 12, maxLength: 12 }),
    fc.oneof(
      fc.constant(undefined),
      fc.constant(null),
      fc.record(
        {
          mode: fieldValue(fc.constantFrom('constant-current', 'switched-resistor')),
          current: anyNumber,
          resistance: anyNumber,
          pulseEnergy: anyNumber,
          delay: anyNumber,
        },
        { requiredKeys: [] },
      ),
    ),
    fc.option(
      fc.array(
        fc.record(
          {
            kind: fieldValue(fc.constantFrom('rc', 'rcd-turnoff', 'rcd-clamp')),
            name: fieldValue(anyString),
            resistance: fieldValue(anyNumber),
            capacitance: fieldValue(anyNumber),
            switchingVoltage: anyNumber,
            switchingFrequency: anyNumber,
            overshoot: anyNumber,
          },
          { requiredKeys: [] },
        ),
        { maxLength: 3 },
      ),
      { nil: undefined },
    ),
    fc.dictionary(anyString, scalar, { maxKeys: 2 }),
  )
  .map(([paths, values, active, snubbers, stray]) => {
    const d: Record<string, unknown> = { ...stray };
    paths.forEach((p, i) => setPath(d, p, values[i]));
    if (active !== undefined) d.active = active;
    if (snubbers !== undefined) d.snubbers = snubbers;
    return d;
  });

const requirement = fc.record(
  {
    safeVoltage: fieldValue(anyNumber),
    maxTime: fieldValue(anyNumber),
    maxEnergy: fieldValue(anyNumber),
    maxCharge: fieldValue(anyNumber),
    fallbackMaxTime: fieldValue(anyNumber),
    condition: fieldValue(anyString),
    reference: fieldValue(anyString),
    singleFault: fieldValue(fc.boolean()),
  },
  { requiredKeys: [] },
);

type Id = number | string;
/** Path ids: the real ones now and then, mostly ids that must not resolve. */
const idOf = (...real: Array<() => Id>) =>
  fc.oneof(
    { weight: 2, arbitrary: fc.constantFrom(...real).map((f) => String(f())) },
    { weight: 3, arbitrary: weirdStrings.map(encodeURIComponent) },
    fc.integer({ min: -5, max: 10_000 }).map(String),
    fc.constantFrom('%ZZ', '%E0%A4%A', '..%2F..%2Fetc', '1%2F2'),
  );
const revisionId = idOf(
  () => ids.draft,
  () => ids.inReview,
  () => ids.approved,
);
const query = fc.dictionary(
  fc.constantFrom('against', 'dossierId', 'token', 'version', 'q', 'limit', 'cursor', 'a[b]', 'x'),
  fc.oneof(anyString, fc.array(anyString, { maxLength: 3 })),
  { maxKeys: 3 },
);

type Body = { json: unknown } | { raw: string; type: string } | { multipart: Multipart } | { none: true };
interface Multipart {
  boundary: string | null;
  fields: Array<[string, string]>;
  files: Array<[string, string, Buffer]>;
  cutAt: number | null;
}

const jsonBody = (shape: fc.Arbitrary<unknown>): fc.Arbitrary<Body> =>
  fc.oneof(
    { weight: 6, arbitrary: shape.map((json) => ({ json })) },
    { weight: 2, arbitrary: anyJson.map((json) => ({ json })) },
    fc
      .constantFrom(
        '{"version":',
        '[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]',
        '{"__proto__":{"admin":true}}',
        'not json',
        '{"a":1}{"b":2}',
        '\u0000',
      )
      .map((raw) => ({ raw, type: 'application/json' })),
    fc
      .tuple(
        anyString,
        fc.constantFrom(
          'text/plain',
          'application/x-www-form-urlencoded',
          'application/json; charset=latin1',
          'multipart/form-data',
          'application/xml',
        ),
      )
      .map(([raw, type]) => ({ raw, type })),
  );

const multipart: fc.Arbitrary<Body> = fc
  .record({
    boundary: fc.oneof(
      { weight: 5, arbitrary: fc.constant('fz-boundary') },
      fc.constant(null),
      fc.constantFrom('', 'x'.repeat(80), 'other-boundary'),
    ),
    fields: fc.array(
      fc.tuple(
        fc.constantFrom('kind', 'version', 'channel', 'markerChannel', 't0', 'extra', 'kind'),
        fc.oneof(fc.constantFrom('waveform', 'image', 'datasheet', 'report', 'other', '1', '2', '0x1'), anyString),
      ),
      { maxLength: 6 },
    ),
    files: fc.array(
      fc.tuple(
        fc.constantFrom('file', 'file', 'other'),
        fc.oneof(fc.constantFrom('log.txt', 'capture.csv', 'Prüfbericht Ω.txt', '../../x', '.hidden', 'a"b.txt'), anyString),
        fc.oneof(
          fc.uint8Array({ maxLength: 300 }).map((a) => Buffer.from(a)),
          fc.constantFrom(
            Buffer.from('t,v\n0,600\n0.1,300\n0.2,150\n0.3,75\n0.4,37\n'),
            Buffer.alloc(0),
            Buffer.from('%PDF-1.4\n%%EOF'),
            Buffer.from([0x89, 0x50, 0x4e, 0x47]),
          ),
        ),
      ),
      { maxLength: 3 },
    ),
    cutAt: fc.option(fc.nat({ max: 400 }), { freq: 3 }),
  })
  .map((multipart) => ({ multipart }));

interface Spec {
  method: 'GET' | 'POST' | 'PATCH' | 'DELETE' | 'PUT';
  path: string;
  query: Record<string, string | string[]>;
  body: Body;
  who: 'anonymous' | 'engineer' | 'reviewer' | 'admin' | 'viewer' | 'garbage';
  origin: 'same' | 'none' | 'foreign';
}

const route = (method: Spec['method'], path: fc.Arbitrary<string>, body: fc.Arbitrary<Body> = fc.constant({ none: true })) =>
  fc.record({ method: fc.constant(method), path, body });
const at = (p: string) => fc.constant(p);
const under = (id: fc.Arbitrary<string>, f: (id: string) => string) => id.map(f);

const ROUTES = [
  route('GET', at('/api/health')),
  // The password is never a valid one: a well-formed attempt costs an Argon2id hash (tests/api/auth.test.ts covers those).
  route(
    'POST',
    at('/api/auth/sign-in'),
    jsonBody(
      fc.record(
        {
          email: fieldValue(fc.constantFrom('engineer@fennel.test', 'nobody@fennel.test')),
          password: fc.oneof(fc.constant(''), fc.string({ minLength: 201, maxLength: 210 }), anyNumber, fc.constant(null)),
        },
        { requiredKeys: [] },
      ),
    ),
  ),
  route('POST', at('/api/auth/sign-out')),
  route('GET', at('/api/auth/me')),
  route('GET', at('/api/auth/session')),
  route('GET', at('/api/auth/invite')),
  route(
    'POST',
    at('/api/auth/set-password'),
    jsonBody(fc.record({ token: fieldValue(anyString), password: fieldValue(anyString) }, { requiredKeys: [] })),
  ),
  route('GET', at('/api/users')),
  route(
    'POST',
    at('/api/users'),
    jsonBody(
      fc.record(
        { email: fieldValue(anyString), name: fieldValue(anyString), role: fieldValue(fc.constantFrom('admin', 'overlord')) },
        { requiredKeys: [] },
      ),
    ),
  ),
  route(
    'PATCH',
    idOf(
      () => ids.viewerUser,
      () => 'no-such-user',
    ).map((id) => `/api/users/${id}`),
    jsonBody(fc.record({ role: fieldValue(fc.constantFrom('overlord', '')), disabled: fieldValue(fc.constantFrom('yes', 0)) }, { requiredKeys: [] })),
  ),
  route(
    'POST',
    idOf(() => ids.viewerUser).map((id) => `/api/users/${id}/invite`),
    jsonBody(anyJson),
  ),
  route('GET', at('/api/outbox')),
  route('POST', at('/api/calc/discharge'), jsonBody(fc.record({ requirement, design }, { requiredKeys: [] }))),
  route(
    'POST',
    at('/api/calc/snubber'),
    jsonBody(
      fc.record(
        {
          f0: fieldValue(anyNumber),
          cAdd: fieldValue(anyNumber),
          f1: fieldValue(anyNumber),
          multiple: fieldValue(anyNumber),
          switchingVoltage: anyNumber,
          switchingFrequency: anyNumber,
        },
        { requiredKeys: [] },
      ),
    ),
  ),
  route('GET', at('/api/products')),
  route(
    'POST',
    at('/api/products'),
    jsonBody(
      fc.record({ name: fieldValue(anyString), modelNumber: fieldValue(anyString), description: fieldValue(anyString) }, { requiredKeys: [] }),
    ),
  ),
  route(
    'GET',
    under(
      idOf(() => ids.product),
      (id) => `/api/products/${id}`,
    ),
  ),
  route('GET', at('/api/dossiers')),
  route(
    'POST',
    at('/api/dossiers'),
    jsonBody(fc.record({ productId: fieldValue(fc.constant(1)), title: fieldValue(anyString), requirement }, { requiredKeys: [] })),
  ),
  route(
    'GET',
    under(
      idOf(() => ids.dossier),
      (id) => `/api/dossiers/${id}`,
    ),
  ),
  route(
    'POST',
    under(
      idOf(() => ids.dossier),
      (id) => `/api/dossiers/${id}/revisions`,
    ),
    jsonBody(fc.record({ fromRevisionId: fieldValue(fc.constant(null).map(() => ids.draft)) }, { requiredKeys: [] })),
  ),
  route(
    'GET',
    under(revisionId, (id) => `/api/revisions/${id}`),
  ),
  route(
    'PATCH',
    under(
      idOf(() => ids.draft),
      (id) => `/api/revisions/${id}`,
    ),
    jsonBody(fc.record({ version: fieldValue(fc.constant('current')), design, notes: fieldValue(anyString) }, { requiredKeys: [] })),
  ),
  route(
    'POST',
    under(
      idOf(
        () => ids.inReview,
        () => ids.approved,
      ),
      (id) => `/api/revisions/${id}/submit`,
    ),
    jsonBody(fc.record({ version: fieldValue(anyNumber) }, { requiredKeys: [] })),
  ),
  route(
    'GET',
    under(revisionId, (id) => `/api/revisions/${id}/diff`),
  ),
  route(
    'POST',
    under(revisionId, (id) => `/api/revisions/${id}/decision`),
    jsonBody(fc.record({ decision: fieldValue(fc.constantFrom('reject', 'APPROVE')), comment: fieldValue(anyString) }, { requiredKeys: [] })),
  ),
  route(
    'POST',
    under(revisionId, (id) => `/api/revisions/${id}/comments`),
    jsonBody(fc.record({ body: fieldValue(anyString) }, { requiredKeys: [] })),
  ),
  route('GET', at('/api/reviews')),
  route('GET', at('/api/audit')),
  route('GET', at('/api/overview')),
  route(
    'POST',
    under(
      idOf(() => ids.draft),
      (id) => `/api/revisions/${id}/evidence`,
    ),
    fc.oneof({ weight: 4, arbitrary: multipart }, jsonBody(anyJson)),
  ),
  route(
    'GET',
    under(
      idOf(() => ids.evidence),
      (id) => `/api/evidence/${id}/file`,
    ),
  ),
  route(
    'DELETE',
    under(
      idOf(() => 999_999),
      (id) => `/api/evidence/${id}`,
    ),
  ),
  route(
    'GET',
    under(fc.constantFrom('0x1', '1e0', ' 1', 'x'), (id) => `/api/revisions/${id}/dossier.pdf`),
  ),
  route(
    'PUT',
    under(revisionId, (id) => `/api/revisions/${id}`),
    jsonBody(anyJson),
  ),
  route(
    'GET',
    anyString.map((s) => `/api/${encodeURIComponent(s)}`),
  ),
];

const request: fc.Arbitrary<Spec> = fc
  .record({
    r: fc.oneof(...ROUTES),
    query,
    who: fc.constantFrom('anonymous', 'engineer', 'engineer', 'engineer', 'reviewer', 'admin', 'admin', 'viewer', 'garbage'),
    origin: fc.constantFrom('same', 'same', 'same', 'same', 'none', 'foreign'),
  })
  .map(({ r, query, who, origin }) => ({ ...r, query, who, origin }));

// ── Sending ────────────────────────────────────────────────────────────────────────────────────────

function multipartBytes(m: Multipart): { bytes: Buffer; type: string } {
  const b = m.boundary ?? 'unused';
  const parts: Buffer[] = [];
  for (const [name, value] of m.fields) parts.push(Buffer.from(`--${b}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`));
  for (const [name, filename, bytes] of m.files) {
    parts.push(
      Buffer.from(
        `--${b}\r\nContent-Disposition: form-data; name="${name}"; filename="${filename.replace(/["\r\n]/g, '_')}"\r\nContent-Type: application/octet-stream\r\n\r\n`,
      ),
      bytes,
      Buffer.from('\r\n'),
    );
  }
  parts.push(Buffer.from(`--${b}--\r\n`));
  const whole = Buffer.concat(parts);
  return {
    bytes: m.cutAt === null ? whole : whole.subarray(0, Math.min(m.cutAt, whole.length)),
    type: m.boundary === null ? 'multipart/form-data' : `multipart/form-data; boundary=${m.boundary}`,
  };
}

async function resolveVersions(value: unknown): Promise<unknown> {
  if (value && typeof value === 'object' && !Array.isArray(value) && (value as { version?: unknown }).version === 'current')
    return { ...value, version: await ids.draftVersion() };
  return value;
}

const STACK = /\n\s+at |\bat [\w.<>]+ \(.*:\d+:\d+\)|node:internal/;
const SQL = /SQLITE_|\b(select|insert into|delete from)\b.*\b(from|values|where)\b|\bupdate\b.*\bset\b/i;
let sent = 0;

async function send(spec: Spec, failures: string[]): Promise<void> {
  const qs = new URLSearchParams();
  for (const [k, v] of Object.entries(spec.query)) for (const one of [v].flat()) qs.append(k, one);
  const url = `${server.url}${spec.path}${qs.size ? `?${qs}` : ''}`;
  const headers: Record<string, string> = {};
  if (spec.who === 'garbage') headers.Cookie = 'voltfall_session=not-a-session; other=%ZZ';
  else if (spec.who !== 'anonymous') headers.Cookie = cookies[spec.who];
  if (spec.origin === 'same') headers.Origin = server.url;
  if (spec.origin === 'foreign') headers.Origin = 'https://elsewhere.example.test';
  let body: Uint8Array<ArrayBuffer> | string | undefined;
  if ('json' in spec.body) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(await resolveVersions(spec.body.json)) ?? 'null';
  } else if ('raw' in spec.body) {
    headers['Content-Type'] = spec.body.type;
    body = spec.body.raw;
  } else if ('multipart' in spec.body) {
    const m = multipartBytes(spec.body.multipart);
    headers['Content-Type'] = m.type;
    body = new Uint8Array(m.bytes);
  }
  const res = await fetch(url, { method: spec.method, headers, body: spec.method === 'GET' ? undefined : body, redirect: 'manual' });
  const text = await res.text();
  sent += 1;
  const problem =
    res.status >= 500
      ? `answered ${res.status}`
      : STACK.test(text)
        ? 'shows a stack trace'
        : SQL.test(text)
          ? 'shows SQL'
          : res.status >= 400 && !/^\{"error":\{"code":"[a-z_]+","message":"/.test(text)
            ? 'error without the error shape'
            : null;
  if (problem) failures.push(`${spec.method} ${spec.path} (${spec.who}) ${problem}: ${text.slice(0, 300)}`);
}

describe('generated bad requests', () => {
  it(`when ${BATCHES * BATCH_SIZE} generated bad requests hit every route, then none answers 5xx or leaks a stack trace or SQL, and the server is healthy afterwards`, async () => {
    const started = Date.now();
    await fc.assert(
      fc.asyncProperty(fc.array(request, { minLength: BATCH_SIZE, maxLength: BATCH_SIZE }), async (batch) => {
        const failures: string[] = [];
        await Promise.all(batch.map((spec) => send(spec, failures)));
        expect(failures).toEqual([]);
      }),
      { numRuns: BATCHES },
    );
    const seconds = ((Date.now() - started) / 1000).toFixed(1);
    console.log(`fuzz: ${sent} generated bad requests over ${ROUTES.length} routes in ${seconds} s, none answered 5xx, leaked a stack trace or SQL`);
    expect(sent).toBeGreaterThanOrEqual(10_000);

    // Healthy afterwards: it answers, a new session works end to end, the record is consistent.
    expect((await server.anonymous().get('/api/health')).body).toEqual({ ok: true });
    const signIn = await server.anonymous().post('/api/auth/sign-in').send({ email: 'engineer@fennel.test', password: DEMO_PASSWORD });
    expect(signIn.status).toBe(200);
    const engineer = await server.signIn('engineer');
    const draft = (await engineer.get(`/api/revisions/${ids.draft}`)).body;
    if (draft.status === 'draft')
      expect((await engineer.patch(`/api/revisions/${ids.draft}`).send({ version: draft.version, design: demoDesign })).status).toBe(200);
    const reviewer = await server.signIn('reviewer');
    expect((await reviewer.get('/api/audit')).body.verified).toBe(true);
    if (TEST_BACKEND === 'sqlite') {
      // The file itself: SQLite's own page-level check.
      const raw = new Database(join(server.dataDir, 'voltfall.sqlite3'));
      try {
        expect(raw.pragma('integrity_check', { simple: true })).toBe('ok');
      } finally {
        raw.close();
      }
    }
    // No upload left half-staged by a refused request.
    expect(server.stagingFiles('evidence')).toEqual([]);
  }, 300_000);
});
