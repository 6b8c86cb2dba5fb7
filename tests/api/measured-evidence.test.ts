// Measured evidence through the API: the probe resistance upload field, captures referred to the
// worst case, one check per capture paired across revisions by the file, and single-fault checks.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

/** An RC decay V0·e^(−t/τ) after a pre-trigger plateau (common practice: the shape of a bleeder discharge). */
function capture(v0: number, tau: number, seconds: number, rows = 4000): Buffer {
  const lines = ['Time (s),CH1 (V)'];
  for (let i = 0; i < rows; i++) {
    const t = -0.1 * seconds + (i * 1.1 * seconds) / rows;
    lines.push(`${t.toExponential(6)},${(t < 0 ? v0 : v0 * Math.exp(-t / tau)).toExponential(6)}`);
  }
  return Buffer.from(lines.join('\n') + '\n');
}

async function draft(title: string, requirement: object = demoRequirement) {
  const engineer = await server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement })).body;
  const id = dossier.revisions[0].id as number;
  await saveDraft(engineer, id, { design: demoDesign });
  return { engineer, id, dossierId: dossier.id as number };
}

interface CheckJson {
  id: string;
  value: number | null;
  pass: boolean;
  detail: string;
  evidenceId?: number;
  evidenceSha256?: string;
  referral?: {
    measuredTime: number | null;
    start: string;
    unloadedTau: number | null;
    probeResistance: number | null;
    loadingCapacitance: number | null;
  };
}
const checksOf = async (engineer: Awaited<ReturnType<TestServer['signIn']>>, id: number): Promise<CheckJson[]> =>
  (await engineer.get(`/api/revisions/${id}`)).body.results.checks;

// demoDesign: 622 V maximum bus; 2 × 3.3 µF at −5 % → C_min = 6.27 µF for the loading correction.
const C_MIN = 2 * 3.3e-6 * 0.95;

describe('a capture is referred to the maximum bus and to the unloaded circuit', () => {
  it('when a capture from 500 V with a 10 MΩ probe is uploaded, then the check is the referred, unloaded time with its id from the file hash', async () => {
    const { engineer, id } = await draft('Referred capture');
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .field('probeResistance', '10 MΩ')
      .attach('file', capture(500, 1.5, 8), 'bench-500V.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.probeResistance).toBe(10e6);

    const checks = await checksOf(engineer, id);
    const key = res.body.sha256.slice(0, 12);
    const time = checks.find((c) => c.id === `measured-discharge:${key}`)!;
    const tau = checks.find((c) => c.id === `measured-tau:${key}`)!;
    expect(time).toMatchObject({ evidenceId: res.body.id, evidenceSha256: res.body.sha256 });
    expect(tau).toMatchObject({ evidenceId: res.body.id, evidenceSha256: res.body.sha256 });
    // Parallel resistances (docs/DOMAIN.md §5.3, common practice): 1/τ = 1/1.5 s − 1/(10 MΩ × 6.27 µF) → 1.5368 s.
    const unloaded = 1 / (1 / 1.5 - 1 / (10e6 * C_MIN));
    expect(tau.value).toBeCloseTo(unloaded, 2);
    // RC decay law (docs/DOMAIN.md §5.3): t = t(500→60 V)·τ_u/τ + τ_u·ln(622/500) = τ_u·ln(622/60) = 3.594 s.
    expect(time.value).toBeCloseTo(unloaded * Math.log(622 / 60), 1);
    expect(time.referral).toMatchObject({ start: 'referred', probeResistance: 10e6 });
    expect(time.referral?.measuredTime).toBeCloseTo(1.5 * Math.log(500 / 60), 1);
    expect(time.referral?.loadingCapacitance).toBeCloseTo(C_MIN, 12);
    expect(time.detail).toMatch(/referred to the 622 V maximum bus by the RC decay law/);
  });

  it('when the probe resistance is not a sensible figure, then 400 names the field and nothing is stored', async () => {
    const { engineer, id } = await draft('Bad probe');
    const cases: Array<[string, RegExp]> = [
      ['0', /greater than zero/],
      ['-10M', /greater than zero/],
      ['ten megohm', /Probe resistance: .*not a number|Probe resistance: .*not a unit/],
      ['500', /below 1 kΩ/],
      ['999 Ω', /below 1 kΩ/],
      ['2,200k', /can be read two ways: write 2200k or 2.2k/],
    ];
    for (const [text, message] of cases) {
      const res = await engineer
        .post(`/api/revisions/${id}/evidence`)
        .field('kind', 'waveform')
        .field('probeResistance', text)
        .attach('file', capture(622, 1.5, 8), 'x.csv');
      expect(res.status, text).toBe(400);
      expect(res.body.error.fields, text).toEqual([{ path: 'probeResistance', message: expect.stringMatching(message) }]);
    }
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(0);
  });

  it('when no probe resistance is given, then the checks say that instrument loading was not corrected', async () => {
    const { engineer, id } = await draft('No probe');
    const res = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'waveform')
      .field('probeResistance', '')
      .attach('file', capture(622, 1.5, 8), 'bench.csv');
    expect(res.status).toBe(201);
    expect(res.body.analysis.probeResistance).toBeNull();
    const time = (await checksOf(engineer, id)).find((c) => c.id.startsWith('measured-discharge:'))!;
    expect(time.detail).toMatch(/instrument loading not corrected \(no probe resistance given\)/);
  });
});

describe('one check per capture, paired across revisions by the file', () => {
  it('when a capture is carried into revision 2, then its checks keep their ids in the diff; when it is replaced, the diff shows removed and added, never paired', async () => {
    const { engineer, id: first } = await draft('Carried capture');
    const a = await engineer
      .post(`/api/revisions/${first}/evidence`)
      .field('kind', 'waveform')
      .attach('file', capture(622, 1.5, 8), 'bench-a.csv');
    expect(a.status).toBe(201);
    const keyA = a.body.sha256.slice(0, 12);
    expect((await engineer.post(`/api/revisions/${first}/submit`)).status).toBe(200);
    const dossierId = (await engineer.get(`/api/revisions/${first}`)).body.dossierId;

    // Revision 2 carries the file; a higher maximum bus changes its referred figure.
    const second = (await engineer.post(`/api/dossiers/${dossierId}/revisions`).send({ fromRevisionId: first })).body;
    expect(second.evidence.map((e: { sha256: string }) => e.sha256)).toEqual([a.body.sha256]);
    await saveDraft(engineer, second.id, { design: { ...demoDesign, bus: { nominalVoltage: 565, maxVoltage: 700 } } });
    const carried = (await engineer.get(`/api/revisions/${second.id}/diff`)).body;
    const pairedA = carried.checks.filter((c: { id: string }) => c.id.endsWith(`:${keyA}`));
    expect(pairedA.map((c: { id: string; kind: string }) => [c.id, c.kind])).toContainEqual([`measured-discharge:${keyA}`, 'value-changed']);
    for (const c of pairedA) {
      expect(c.evidence).toEqual({ name: 'bench-a.csv', sha256: a.body.sha256 });
      expect(c.from).not.toBeNull();
      expect(c.to).not.toBeNull();
    }
    // From 622 V as measured to 700 V referred: + τ·ln(700/622) = 1.5 s × 0.1181 = 0.177 s (RC decay law).
    const timeA = pairedA.find((c: { id: string }) => c.id === `measured-discharge:${keyA}`);
    expect(timeA.to.value - timeA.from.value).toBeCloseTo(1.5 * Math.log(700 / 622), 1);
    expect(carried.evidence).toEqual({ added: [], removed: [] });
    const design = carried.checks.find((c: { id: string }) => c.id === 'discharge-time');
    expect(design.evidence).toBeNull();

    // The file is replaced by a new capture of a slower sample.
    const carriedRow = second.evidence[0].id;
    expect((await engineer.delete(`/api/evidence/${carriedRow}`)).status).toBe(200);
    const b = await engineer
      .post(`/api/revisions/${second.id}/evidence`)
      .field('kind', 'waveform')
      .attach('file', capture(700, 1.9, 10), 'bench-b.csv');
    expect(b.status).toBe(201);
    const keyB = b.body.sha256.slice(0, 12);
    const replaced = (await engineer.get(`/api/revisions/${second.id}/diff`)).body;
    const measured = replaced.checks.filter((c: { id: string }) => c.id.startsWith('measured-'));
    expect(measured.map((c: { id: string; kind: string }) => [c.id, c.kind]).sort()).toEqual(
      [
        [`measured-discharge:${keyA}`, 'removed'],
        [`measured-tau:${keyA}`, 'removed'],
        [`measured-discharge:${keyB}`, 'added'],
        [`measured-tau:${keyB}`, 'added'],
      ].sort(),
    );
    for (const c of measured) {
      const file = c.id.endsWith(keyA) ? { name: 'bench-a.csv', sha256: a.body.sha256 } : { name: 'bench-b.csv', sha256: b.body.sha256 };
      expect(c.evidence).toEqual(file);
      expect(c.kind === 'removed' ? c.to : c.from).toBeNull();
    }
    expect(replaced.evidence.added.map((e: { name: string }) => e.name)).toEqual(['bench-b.csv']);
    expect(replaced.evidence.removed.map((e: { name: string }) => e.name)).toEqual(['bench-a.csv']);
  });
});

describe('single-fault condition in a dossier and in the stateless check', () => {
  it('when a dossier asks for the single-fault condition, then the fault checks count in the verdict', async () => {
    // demoDesign: one string of 2 × 100 kΩ; one open leaves no path.
    const { engineer, id } = await draft('Single fault', { ...demoRequirement, singleFault: true });
    const rev = (await engineer.get(`/api/revisions/${id}`)).body;
    expect(rev.dossier.requirement).toMatchObject({ singleFault: true });
    const checks: CheckJson[] = rev.results.checks;
    expect(checks.find((c) => c.id === 'single-fault-time')).toMatchObject({ value: null, pass: false });
    // One of 2 × 100 kΩ shorted: the other carries the 622 V bus, 622² / (100 kΩ × (1 − 1 %) × (1 − 100 ppm/K × 50 K)) = 3.93 W against the 3 W rating.
    const power = checks.find((c) => c.id === 'single-fault-power')!;
    expect(power.value).toBeCloseTo(622 ** 2 / (100e3 * 0.99 * (1 - 100e-6 * 50)), 6);
    expect(power.pass).toBe(false);
    expect(checks.find((c) => c.id === 'single-fault-voltage')).toMatchObject({ value: 622, pass: false });
    expect(rev.results.verdict).toBe('fails');
  });

  it('when the stateless check gets singleFault, then it answers the fault checks; bad single-fault fields get 400 naming them', async () => {
    const engineer = await server.signIn('engineer');
    const design = { ...demoDesign, bleeder: { ...demoDesign.bleeder, parallel: 2, resistance: 50e3 } };
    const ok = await engineer
      .post('/api/calc/discharge')
      .send({ requirement: { ...demoRequirement, singleFault: true, singleFaultMaxTime: 10 }, design });
    expect(ok.status).toBe(200);
    expect(ok.body.checks.find((c: CheckJson) => c.id === 'single-fault-time')).toMatchObject({ limit: 10, pass: true });
    const off = await engineer.post('/api/calc/discharge').send({ requirement: demoRequirement, design });
    expect(off.body.checks.map((c: CheckJson) => c.id)).not.toContain('single-fault-time');
    for (const [field, value] of [
      ['singleFault', 'yes'],
      ['singleFaultMaxTime', -1],
      ['singleFaultMaxTime', 'long'],
    ] as const) {
      const bad = await engineer.post('/api/calc/discharge').send({ requirement: { ...demoRequirement, [field]: value }, design });
      expect(bad.status, `${field}=${value}`).toBe(400);
      expect(bad.body.error.fields.map((f: { path: string }) => f.path)).toEqual([`requirement.${field}`]);
    }
  });
});
