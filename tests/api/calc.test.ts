// The stateless calculation routes: nonsense gets field-level 400s, never a 500.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type supertest from 'supertest';
import { CHART_TOLERANCE, computeDischarge } from '../../shared/engine';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
let engineer: supertest.Agent;
beforeAll(async () => {
  server = await startTestServer();
  engineer = await server.signIn('engineer');
});
afterAll(() => server.close());

const withBank = (capacitors: Record<string, unknown>) => ({
  requirement: demoRequirement,
  design: { ...demoDesign, capacitors: { ...demoDesign.capacitors, ...capacitors } },
});

describe('POST /api/calc/discharge', () => {
  it('answers the result of a complete design with every check saying what decided it', async () => {
    const res = await engineer.post('/api/calc/discharge').send({ requirement: demoRequirement, design: demoDesign });
    expect(res.status).toBe(200);
    expect(res.body.verdict).toBe('meets');
    for (const check of res.body.checks) expect(check.detail.length).toBeGreaterThan(10);
  });

  const nonsense: Array<[string, unknown, string]> = [
    ['zero capacitance', withBank({ capacitance: 0 }), 'design.capacitors.capacitance'],
    ['negative capacitance', withBank({ capacitance: -4.7e-4 }), 'design.capacitors.capacitance'],
    ['capacitance as text', withBank({ capacitance: '470u' }), 'design.capacitors.capacitance'],
    [
      'NaN (null in JSON) where a number belongs',
      { requirement: { ...demoRequirement, safeVoltage: null }, design: demoDesign },
      'requirement.safeVoltage',
    ],
    ['an absurd 1e30 F bank', withBank({ capacitance: 1e30 }), 'design.capacitors.capacitance'],
    ['a fractional count', withBank({ series: 1.5 }), 'design.capacitors.series'],
    [
      'zero resistance',
      { requirement: demoRequirement, design: { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 0 } } },
      'design.bleeder.resistance',
    ],
  ];
  for (const [what, body, path] of nonsense) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      const res = await engineer.post('/api/calc/discharge').send(body as object);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
    });
  }

  it('answers 400, not 500, for Infinity smuggled as a huge literal and for a body that is not an object', async () => {
    const huge = await engineer
      .post('/api/calc/discharge')
      .set('Content-Type', 'application/json')
      .send('{"requirement":{"safeVoltage":60,"maxTime":1e999},"design":{}}');
    expect(huge.status).toBe(400);
    expect(huge.body.error.fields.map((f: { path: string }) => f.path)).toContain('requirement.maxTime');
    const array = await engineer.post('/api/calc/discharge').send([1, 2, 3]);
    expect(array.status).toBe(400);
  });

  it('treats a bus already at or below the safe voltage as valid input and says so', async () => {
    const res = await engineer
      .post('/api/calc/discharge')
      .send({ requirement: demoRequirement, design: { ...demoDesign, bus: { nominalVoltage: 40, maxVoltage: 48 } } });
    expect(res.status).toBe(200);
    const time = res.body.checks.find((c: { id: string }) => c.id === 'discharge-time');
    expect(time.value).toBe(0);
    expect(time.pass).toBe(true);
    expect(time.detail).toMatch(/already|at or below/i);
  });

  it('answers the curve at the chart resolution: within a thousandth of the top voltage of every full-curve point, the marked instants exact', async () => {
    const body = { requirement: demoRequirement, design: demoDesign };
    const chart = (await engineer.post('/api/calc/discharge').send(body)).body;
    const full = await engineer.post('/api/calc/discharge?curve=full').send(body);
    expect(full.status).toBe(200);
    type P = { t: number; v: number; vWorst: number };
    const fullCurve: P[] = full.body.curve;
    const chartCurve: P[] = chart.curve;
    expect(fullCurve).toEqual(computeDischarge(body).curve);
    expect(chartCurve.length).toBeLessThan(fullCurve.length / 2);
    expect(JSON.stringify(chart).length).toBeLessThan(JSON.stringify(full.body).length / 2);
    // Linear interpolation of the thinned curve, as the chart draws it.
    const at = (t: number, key: 'v' | 'vWorst') => {
      const i = chartCurve.findIndex((p) => p.t >= t);
      if (chartCurve[i].t === t) return chartCurve[i][key];
      const [a, b] = [chartCurve[i - 1], chartCurve[i]];
      return a[key] + ((t - a.t) / (b.t - a.t)) * (b[key] - a[key]);
    };
    const top = Math.max(...fullCurve.map((p) => Math.max(p.v, p.vWorst)));
    // The thinning tolerance plus the rounding of kept points to 5 significant digits.
    const allowed = (CHART_TOLERANCE + 1e-4) * top;
    for (const p of fullCurve) {
      expect(Math.abs(at(p.t, 'v') - p.v)).toBeLessThanOrEqual(allowed);
      expect(Math.abs(at(p.t, 'vWorst') - p.vWorst)).toBeLessThanOrEqual(allowed);
    }
    const times = chartCurve.map((p) => p.t);
    expect(times).toEqual(
      expect.arrayContaining([chart.nominal.timeToSafe, chart.worstCase.timeToSafe, chart.worstCase.tau, demoRequirement.maxTime]),
    );
    expect(chart.checks).toEqual(full.body.checks);
    const bad = await engineer.post('/api/calc/discharge?curve=every').send(body);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('curve');
  });

  it('reports an unfinished design as incomplete with the missing fields, not as an error', async () => {
    const res = await engineer.post('/api/calc/discharge').send({ requirement: demoRequirement, design: { bus: demoDesign.bus } });
    expect(res.status).toBe(200);
    expect(res.body.verdict).toBe('incomplete');
    expect(res.body.missing).toEqual(expect.arrayContaining(['design.bleeder', 'design.capacitors']));
  });
});

describe('POST /api/calc/snubber', () => {
  it('sizes from the ringing measurement (docs/DOMAIN.md §4 E12, a computed example)', async () => {
    const res = await engineer.post('/api/calc/snubber').send({ f0: 20e6, cAdd: 300e-12, f1: 10e6 });
    expect(res.status).toBe(200);
    expect(res.body.cPar).toBeCloseTo(100e-12, 15);
    expect(res.body.resistance).toBeCloseTo(79.6, 1);
  });

  const bad: Array<[string, Record<string, unknown>, string]> = [
    ['f1 above f0', { f0: 10e6, cAdd: 300e-12, f1: 20e6 }, 'f1'],
    ['f1 equal to f0', { f0: 10e6, cAdd: 300e-12, f1: 10e6 }, 'f1'],
    ['zero added capacitance', { f0: 20e6, cAdd: 0, f1: 10e6 }, 'cAdd'],
    ['negative frequency', { f0: -20e6, cAdd: 300e-12, f1: 10e6 }, 'f0'],
    ['an absurd 1e15 Hz', { f0: 1e15, cAdd: 300e-12, f1: 10e6 }, 'f0'],
    ['text for a number', { f0: '20 MHz', cAdd: 300e-12, f1: 10e6 }, 'f0'],
  ];
  for (const [what, body, path] of bad) {
    it(`answers 400 naming ${path} for ${what}`, async () => {
      const res = await engineer.post('/api/calc/snubber').send(body);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
    });
  }
});
