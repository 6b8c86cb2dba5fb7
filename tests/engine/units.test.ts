// Engineers' notation: SI prefixes (SI Brochure), resistor RKM codes (IEC 60062), SPICE "meg".
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  formatPercent,
  formatQuantity,
  parsePercent,
  parsePpmPerK,
  parseQuantity,
  type QuantityUnit,
} from '../../shared/units';

const accepted: [string, QuantityUnit, number][] = [
  ['470u', 'F', 470e-6],
  ['470 µF', 'F', 470e-6],
  ['470 μF', 'F', 470e-6], // Greek mu, as some keyboards type it
  ['470uF', 'F', 470e-6],
  ['4u7', 'F', 4.7e-6],
  ['1.32 µF', 'F', 1.32e-6],
  ['100n', 'F', 100e-9],
  ['2k2', 'Ω', 2200],
  ['4R7', 'Ω', 4.7],
  ['1M5', 'Ω', 1.5e6],
  ['4.7 MΩ', 'Ω', 4.7e6],
  ['4.7Meg', 'Ω', 4.7e6],
  ['4.7 meg', 'Ω', 4.7e6],
  ['4.7M', 'Ω', 4.7e6],
  ['220k', 'Ω', 220e3],
  ['220 kohm', 'Ω', 220e3],
  ['10K', 'Ω', 10e3],
  ['0.5 W', 'W', 0.5],
  ['500 mW', 'W', 0.5],
  ['100 ms', 's', 0.1],
  ['2 min', 's', 120],
  ['1 h', 's', 3600],
  ['1e-3', 's', 1e-3],
  ['622 V', 'V', 622],
  ['1.2 kV', 'V', 1200],
  ['200 mA', 'A', 0.2],
  ['45 µC', 'C', 45e-6],
  ['0.2 J', 'J', 0.2],
  ['250 kHz', 'Hz', 250e3],
  ['633 nH', 'H', 633e-9],
  ['3,3 kΩ', 'Ω', 3300], // decimal comma
];

describe('parseQuantity', () => {
  it.each(accepted)('reads %s as %s → %s', (text, unit, value) => {
    const result = parseQuantity(text, unit);
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.value).toBeCloseTo(value, 12 - Math.ceil(Math.log10(Math.abs(value))));
  });

  const rejected: [string, QuantityUnit, RegExp][] = [
    ['470 parsecs', 'F', /“parsecs” is not a unit of capacitance/],
    ['4.7 inch', 'F', /is not a capacitance/],
    ['2 min', 'F', /is not a capacitance/],
    ['-3 F', 'F', /must be positive/],
    ['0 Ω', 'Ω', /greater than zero/],
    ['abc', 'F', /is not a number/],
    ['', 'V', /Enter a voltage/],
    ['F', 'F', /no number/],
    ['1e999', 'F', /finite/],
  ];
  it.each(rejected)('rejects %s for %s with a clear message', (text, unit, message) => {
    const result = parseQuantity(text, unit);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error).toMatch(message);
  });

  it('accepts zero and negatives only when asked', () => {
    expect(parseQuantity('0 s', 's', { allowZero: true })).toEqual({ ok: true, value: 0 });
    expect(parseQuantity('-25', 'K', { allowNegative: true })).toEqual({ ok: true, value: -25 });
  });

  it('reads back what formatQuantity writes (round trip within the shown digits)', () => {
    const units: QuantityUnit[] = ['F', 'Ω', 'V', 'W', 'A', 'J', 'C', 'Hz', 'H'];
    fc.assert(
      fc.property(fc.double({ min: -13, max: 12, noNaN: true }), fc.constantFrom(...units), (exponent, unit) => {
        const value = 10 ** exponent;
        const text = formatQuantity(value, unit, 6);
        const back = parseQuantity(text, unit);
        expect(back.ok).toBe(true);
        if (back.ok) expect(Math.abs(back.value - value) / value).toBeLessThan(1e-5);
      }),
      { seed: 301, numRuns: 300 },
    );
  });
});

describe('formatQuantity', () => {
  const table: [number, string, number, string][] = [
    [4.7e-4, 'F', 3, '470 µF'],
    [2200, 'Ω', 3, '2.2 kΩ'],
    [4.7e6, 'Ω', 3, '4.7 MΩ'],
    [0.52033, 's', 3, '520 ms'],
    [111.82, 's', 5, '111.82 s'],
    [3600, 's', 3, '3600 s'],
    [0.2405, 'W', 2, '240 mW'],
    [60.75, 'J', 4, '60.75 J'],
    [45e-6, 'C', 3, '45 µC'],
    [999.96, 'V', 3, '1 kV'],
    [0, 'V', 3, '0 V'],
    [-0.01, 'A', 3, '-10 mA'],
  ];
  it.each(table)('%s %s (%i digits) → %s', (value, unit, digits, text) => {
    expect(formatQuantity(value, unit, digits)).toBe(text);
  });
});

describe('percent and TCR', () => {
  it('reads "1 %" and "0.01" alike, and formats back', () => {
    expect(parsePercent('1 %')).toEqual({ ok: true, value: 0.01 });
    expect(parsePercent('1%')).toEqual({ ok: true, value: 0.01 });
    expect(parsePercent('0.01')).toEqual({ ok: true, value: 0.01 });
    expect(parsePercent('-1 %').ok).toBe(false);
    expect(parsePercent('one percent').ok).toBe(false);
    expect(formatPercent(0.2)).toBe('20 %');
  });

  it('reads TCR as ppm/K in any usual form', () => {
    for (const text of ['100 ppm/K', '100ppm/°C', '100', '1e-4/K']) {
      const result = parsePpmPerK(text);
      expect(result.ok).toBe(true);
      if (result.ok) expect(result.value).toBeCloseTo(100, 9);
    }
    expect(parsePpmPerK('-50 ppm/K')).toEqual({ ok: true, value: -50 });
    expect(parsePpmPerK('hot').ok).toBe(false);
  });
});
