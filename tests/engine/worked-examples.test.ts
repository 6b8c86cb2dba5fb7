// Published worked examples of docs/DOMAIN.md §4, each checked to the rounding its source gives.
import { describe, expect, it } from 'vitest';
import {
  balancingBound,
  busFromMains,
  computeDischarge,
  maxContinuousVoltage,
  maxDischargeResistance,
  minDischargeCurrent,
  rcVoltage,
  safeThreshold,
  storedCharge,
  storedEnergy,
} from '../../shared/engine';
import type { Check, DischargeResult } from '../../shared/schema/discharge';
import { idealDesign, idealInput, requirement } from './fixtures';

function check(result: DischargeResult, id: string): Check {
  const found = result.checks.find((c) => c.id === id);
  if (!found) throw new Error(`no check ${id} in ${result.checks.map((c) => c.id).join(', ')}`);
  return found;
}

describe('E1 — [S2] "Protection against residual voltage" (IEC 60204-1 summary, bleeder worked example)', () => {
  it('takes the bus from 230 V mains +10 % as 357.8 V peak', () => {
    // [S2]: 253 V · √2 ≈ 357.8 V.
    expect(busFromMains(230, 0.1)).toBeCloseTo(357.8, 1);
  });

  it('gives R_max = 317 kΩ for 1.32 µF, 360 V → 60 V within 0.75 s', () => {
    // [S2]: R_max = 317 kΩ (using 360 V).
    expect(Math.round(maxDischargeResistance(0.75, 1.32e-6, 360, 60) / 1e3)).toBe(317);
  });

  it('with the chosen 220 kΩ: τ = 0.290 s and t = 0.520 s', () => {
    const result = computeDischarge(idealInput({ capacitance: 1.32e-6, voltage: 360, safeVoltage: 60, maxTime: 0.75, resistance: 220e3 }));
    // [S2] (t with 220 kΩ recomputed in docs/DOMAIN.md §4): τ = 0.290 s, t = 0.520 s.
    expect(result.worstCase?.tau).toBeCloseTo(0.29, 3);
    expect(check(result, 'discharge-time').value).toBeCloseTo(0.52, 3);
    expect(check(result, 'discharge-time').pass).toBe(true);
    expect(result.verdict).toBe('meets');
  });

  it('dissipates 0.24 W at 230 V and 0.29 W at 253 V', () => {
    // [S2]: P = 230²/220k = 0.24 W (0.29 W at 253 V).
    for (const [voltage, watts] of [
      [230, 0.24],
      [253, 0.29],
    ] as const) {
      const result = computeDischarge(idealInput({ capacitance: 1.32e-6, voltage, safeVoltage: 60, maxTime: 0.75, resistance: 220e3 }));
      expect(check(result, 'resistor-power').value).toBeCloseTo(watts, 2);
    }
  });
});

describe('E3 — [S11] AMK "Calculation example – discharging circuit"', () => {
  const input = idealInput({ capacitance: 300e-6, voltage: 600, safeVoltage: 50, maxTime: 300, resistance: 150e3 });
  const result = computeDischarge(input);

  it('τ = 45 s and t(600 V → 50 V) = 111.82 s (1.86 min)', () => {
    // [S11]: τ = 45 s, t = 111.82 s.
    expect(result.worstCase?.tau).toBeCloseTo(45, 6);
    expect(check(result, 'discharge-time').value).toBeCloseTo(111.82, 2);
    expect((check(result, 'discharge-time').value ?? 0) / 60).toBeCloseTo(1.86, 2);
  });

  it('leaves about 0.76 V after 300 s (the source rounds to "1 V")', () => {
    // [S11] rounds to 1 V; docs/DOMAIN.md §4 gives 0.76 V.
    expect(rcVoltage(600, 45, 300)).toBeCloseTo(0.76, 2);
    expect(Math.round(rcVoltage(600, 45, 300))).toBe(1);
    const at300 = result.curve.find((p) => p.t === 300);
    expect(at300?.vWorst).toBeCloseTo(0.76, 2);
  });

  it('dissipates 2.4 W continuously at 600 V', () => {
    // docs/DOMAIN.md §4 E3: P computed = 2.4 W.
    expect(check(result, 'resistor-power').value).toBeCloseTo(2.4, 6);
  });
});

describe('E4 — [S10] active-discharge reference design scenario: 600 µF, 450 V → 60 V in < 2 s', () => {
  const base = { capacitance: 600e-6, voltage: 450, safeVoltage: 60, maxTime: 2, resistance: 1e6 };

  it('stores 60.75 J at 450 V and 1.08 J at 60 V', () => {
    // docs/DOMAIN.md §4 E4 (numbers computed for the [S10] scenario).
    expect(storedEnergy(600e-6, 450)).toBeCloseTo(60.75, 2);
    expect(storedEnergy(600e-6, 60)).toBeCloseTo(1.08, 2);
    const result = computeDischarge(idealInput(base));
    expect(check(result, 'stored-energy').value).toBeCloseTo(60.75, 2);
    expect(check(result, 'stored-energy').detail).toContain('1.08 J at the 60 V safe voltage');
  });

  it('switched resistor: R ≤ 1.654 kΩ, peak 0.272 A and 122 W', () => {
    expect(maxDischargeResistance(2, 600e-6, 450, 60) / 1e3).toBeCloseTo(1.654, 3);
    const result = computeDischarge(
      idealInput(base, {
        active: { mode: 'switched-resistor', resistance: 1654, pulseEnergy: 100, delay: 0, powerRating: null },
      }),
    );
    const time = check(result, 'discharge-time');
    expect(time.pass).toBe(true);
    expect(time.value).toBeLessThan(2);
    expect(time.value).toBeCloseTo(2, 2);
    expect(check(result, 'active-peak-power').value).toBeCloseTo(122, 0);
    expect(check(result, 'active-peak-power').detail).toContain('272 mA');
    expect(check(result, 'active-pulse-energy').value).toBeCloseTo(60.75, 2);
    expect(check(result, 'active-pulse-energy').pass).toBe(true);
  });

  it('constant current: I ≥ 0.117 A; 0.2 A reaches 60 V in 1.17 s', () => {
    expect(minDischargeCurrent(2, 600e-6, 450, 60)).toBeCloseTo(0.117, 3);
    const result = computeDischarge(idealInput(base, { active: { mode: 'constant-current', current: 0.2, delay: 0 } }));
    expect(check(result, 'discharge-time').value).toBeCloseTo(1.17, 2);
    expect(check(result, 'discharge-time').pass).toBe(true);
    // The 1 MΩ bleeder alone is far too slow: the fallback check reports it, with no limit set.
    expect(check(result, 'passive-fallback-time').limit).toBeNull();
  });
});

describe('E5 — [S16] Vishay RCM series tutorial (derating): 1 W at 70 °C, 10 kΩ', () => {
  it('allows 100 V at 70 °C and 59.16 V at 125 °C (35 %)', () => {
    expect(maxContinuousVoltage(10e3, 1)).toBeCloseTo(100, 6);
    expect(maxContinuousVoltage(10e3, 1, 0.35)).toBeCloseTo(59.16, 2);
  });

  it('the dissipation check passes at 59.16 V and fails just above with 35 % derating', () => {
    const design = (voltage: number) =>
      idealDesign(
        { capacitance: 1e-6, voltage, resistance: 10e3 },
        {
          bleeder: { ...idealDesign({ capacitance: 1e-6, voltage, resistance: 10e3 }).bleeder, powerRating: 1, derating: 0.35 },
        },
      );
    const at = (voltage: number) =>
      check(computeDischarge({ requirement: requirement({ safeVoltage: 30 }), design: design(voltage) }), 'resistor-power');
    expect(at(59.16).pass).toBe(true);
    expect(at(59.16).margin).toBeCloseTo(0, 3);
    expect(at(59.3).pass).toBe(false);
  });
});

describe('E6 — [S3] IEC 61010-1 6.10.3 case (emc-pstc thread): 4.4 µF filter reads 80 V at 5 s', () => {
  it('stores 352 µC > 45 µC, and 45 µC corresponds to 10.2 V on 4.4 µF', () => {
    expect(storedCharge(4.4e-6, 80) * 1e6).toBeCloseTo(352, 6);
    const threshold = safeThreshold(4.4e-6, { safeVoltage: 60, maxCharge: 45e-6 });
    expect(threshold.all.find((c) => c.criterion === 'charge')?.voltage).toBeCloseTo(10.2, 1);
  });

  it('fails the charge criterion (and the voltage one) when the design reads 80 V at 5 s', () => {
    // Bleeder chosen so that 373 V (264 V · √2, the thread's peak) decays to exactly 80 V at 5 s.
    const resistance = 5 / (4.4e-6 * Math.log(373 / 80));
    const result = computeDischarge({
      requirement: requirement({ safeVoltage: 60, maxTime: 5, maxCharge: 45e-6 }),
      design: idealDesign({ capacitance: 4.4e-6, voltage: 373, resistance }),
    });
    const charge = check(result, 'charge');
    expect((charge.value ?? 0) * 1e6).toBeCloseTo(352, 3);
    expect(charge.pass).toBe(false);
    expect(charge.detail).toMatch(/no allowed criterion is met in time/);
    expect(check(result, 'discharge-time').pass).toBe(false);
    expect(result.verdict).toBe('fails');
  });
});

describe('docs/DOMAIN.md §3.2 (derived): 60 V or 0.2 J, the ISO 6469-4 energy alternative [S7]', () => {
  it('the 0.2 J point comes above 60 V below 111 µF, and the 60 V point first above it', () => {
    const criterion = (c: number) => safeThreshold(c, { safeVoltage: 60, maxEnergy: 0.2 }).criterion;
    expect(criterion(110e-6)).toBe('energy');
    expect(criterion(112e-6)).toBe('voltage');
  });

  it('a large bank meets the requirement by voltage although 0.2 J is not reached: verdict "meets"', () => {
    const result = computeDischarge({
      requirement: requirement({ safeVoltage: 60, maxTime: 5, maxEnergy: 0.2 }),
      design: idealDesign({ capacitance: 1e-3, voltage: 400, resistance: 2e3 }),
    });
    const energy = check(result, 'stored-energy');
    expect(energy.alternative).toBe(true);
    expect(energy.pass).toBe(false);
    expect(energy.detail).toMatch(/not needed: the 60 V safe voltage is met at/);
    expect(check(result, 'discharge-time').pass).toBe(true);
    expect(result.verdict).toBe('meets');
  });
});

describe('E8 — IEC 60335-1 cl. 22.5 limits [S5] (docs/DOMAIN.md §4, computed): 1 µF, 357.8 V → 34 V within 1 s', () => {
  it('needs R ≤ 425 kΩ', () => {
    expect(Math.round(maxDischargeResistance(1, 1e-6, 357.8, 34) / 1e3)).toBe(425);
  });
});

describe('E9 — balancing, docs/DOMAIN.md §3.7 (computed): 2 × 450 V caps, 800 V bus, I_max 1 mA', () => {
  const design = idealDesign(
    { capacitance: 1000e-6, voltage: 800, resistance: 100e3 },
    {
      balancing: { leakageCurrent: 1e-3, capacitorVoltageRating: 450 },
    },
  );
  design.capacitors = { ...design.capacitors, series: 2 };
  design.bleeder = { ...design.bleeder, series: 2 };
  const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 300 }), design });

  it('R ≤ 100 kΩ per capacitor', () => {
    expect(balancingBound(2, { leakageCurrent: 1e-3, capacitorVoltageRating: 450 }, 800)).toBeCloseTo(100e3, 6);
    expect(check(result, 'balancing').limit).toBeCloseTo(100e3, 6);
    expect(check(result, 'balancing').value).toBeCloseTo(100e3, 6);
  });

  it('P = 400²/100k = 1.6 W each', () => {
    expect(check(result, 'resistor-power').value).toBeCloseTo(1.6, 9);
  });

  it('with 2 × 1000 µF: τ = 100 s and t(800 → 60 V) = 259 s', () => {
    expect(result.worstCase?.tau).toBeCloseTo(100, 9);
    expect(Math.round(check(result, 'discharge-time').value ?? 0)).toBe(259);
  });
});

describe('E11 — [S22] resistor-factory.com glossary "balance resistor": 90 kΩ across 450 V', () => {
  it('draws 5 mA but dissipates 2.25 W, which a 2 W part cannot carry: the check flags it', () => {
    const result = computeDischarge({
      requirement: requirement({ safeVoltage: 60, maxTime: 100 }),
      design: idealDesign(
        { capacitance: 100e-6, voltage: 450, resistance: 90e3 },
        {
          bleeder: { ...idealDesign({ capacitance: 100e-6, voltage: 450, resistance: 90e3 }).bleeder, powerRating: 2 },
        },
      ),
    });
    expect(450 / 90e3).toBeCloseTo(5e-3, 12);
    const power = check(result, 'resistor-power');
    expect(power.value).toBeCloseTo(2.25, 9);
    expect(power.pass).toBe(false);
    expect(result.verdict).toBe('fails');
  });
});
