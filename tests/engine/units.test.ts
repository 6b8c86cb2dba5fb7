// Engineers' notation: SI prefixes (SI Brochure), resistor RKM codes (IEC 60062), SPICE "meg".
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatPercent, formatQuantity, parseCelsius, parsePercent, parsePpmPerK, parseQuantity, type QuantityUnit } from '../../shared/units';

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
  ['2,2u', 'F', 2.2e-6], // a comma before one, two or four digits can only be a decimal comma
  ['4,7 MΩ', 'Ω', 4.7e6],
  ['2,2000u', 'F', 2.2e-6],
  ['2.200u', 'F', 2.2e-6], // a dot is always the decimal mark
  // Spellings seen on drawings and test reports.
  ['800 VDC', 'V', 800],
  ['60 V DC', 'V', 60],
  ['800 Vdc', 'V', 800],
  ['1 kVDC', 'V', 1000],
  ['470uf', 'F', 470e-6],
  ['470 uF', 'F', 470e-6],
  ['4M7', 'Ω', 4.7e6],
  ['10 meg', 'Ω', 10e6],
  ['10 megohm', 'Ω', 10e6],
  ['1 kV', 'V', 1000],
  ['10 mΩ', 'Ω', 0.01],
  ['5 ms', 's', 0.005],
  ['5 min', 's', 300],
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

  // Text an engineer could mean two ways is refused, and the message offers both readings.
  const ambiguous: [string, QuantityUnit, string][] = [
    ['2,200u', 'F', '2,200u can be read two ways: write 2200u or 2.2u'],
    ['1,000k', 'Ω', '1,000k can be read two ways: write 1000k or 1k'],
    ['1,234.5 V', 'V', '1,234.5 V can be read two ways: write 1234.5 V or 1.2345 V'],
    ['1.234,5 V', 'V', '1.234,5 V can be read two ways: write 1.2345 V or 1234.5 V'],
    ['1,000,000', 'Ω', '“1,000,000” has thousands separators: write 1000000'],
    ['5 m', 's', '5 m can be read two ways: write 5 ms or 5 min'],
    ['4.7m', 'Ω', '4.7m can be read two ways: write 4.7 mΩ or 4.7 MΩ'],
    ['4m7', 'Ω', '4m7 can be read two ways: write 4.7 mΩ or 4.7 MΩ'],
    ['10 mf', 'F', '10 mf can be read two ways: write 10 mF or 10 µF'],
    ['10MFD', 'F', '10MFD can be read two ways: write 10 mF or 10 µF'],
  ];
  it.each(ambiguous)('refuses %s for %s and offers both readings', (text, unit, message) => {
    expect(parseQuantity(text, unit)).toEqual({ ok: false, error: message });
  });

  it('takes an AC mark only where the field holds an AC value, and a DC mark only where it holds DC', () => {
    expect(parseQuantity('230 VAC', 'V', { supply: 'ac' })).toEqual({ ok: true, value: 230 });
    expect(parseQuantity('230 V rms', 'V', { supply: 'ac' })).toEqual({ ok: true, value: 230 });
    expect(parseQuantity('400 V', 'V', { supply: 'ac' })).toEqual({ ok: true, value: 400 });
    expect(parseQuantity('230 VAC', 'V')).toEqual({ ok: false, error: expect.stringMatching(/is an AC voltage; this field takes a DC voltage/) });
    expect(parseQuantity('800 VDC', 'V', { supply: 'ac' })).toEqual({
      ok: false,
      error: expect.stringMatching(/is a DC voltage; this field takes an AC \(RMS\) voltage/),
    });
  });

  it('refuses several decimal points, and separators in percentages and temperatures too', () => {
    expect(parseQuantity('1.2.3', 'V')).toEqual({ ok: false, error: expect.stringMatching(/not a number: write it with one decimal point/) });
    expect(parsePercent('2,500 %')).toEqual({ ok: false, error: '2,500 % can be read two ways: write 2500 % or 2.5 %' });
    expect(parsePercent('1,5 %')).toEqual({ ok: true, value: 0.015 });
    expect(parseCelsius('1,000')).toEqual({ ok: false, error: '1,000 can be read two ways: write 1000 or 1' });
    expect(parseCelsius('−25 °C')).toEqual({ ok: true, value: -25 });
    expect(parseCelsius('85')).toEqual({ ok: true, value: 85 });
  });

  it('accepts zero and negatives only when asked', () => {
    expect(parseQuantity('0 s', 's', { allowZero: true })).toEqual({ ok: true, value: 0 });
    expect(parseQuantity('-25', 'K', { allowNegative: true })).toEqual({ ok: true, value: -25 });
  });

  it('reads back what formatQuantity writes, at any precision and sign (round trip)', () => {
    const units: QuantityUnit[] = ['F', 'Ω', 'V', 'W', 's', 'A', 'J', 'C', 'Hz', 'H', 'K'];
    fc.assert(
      fc.property(
        fc.double({ min: -13, max: 12, noNaN: true }),
        fc.boolean(),
        fc.integer({ min: 1, max: 9 }),
        fc.constantFrom(...units),
        (exponent, negative, digits, unit) => {
          const value = (negative ? -1 : 1) * 10 ** exponent;
          const text = formatQuantity(value, unit, digits);
          const back = parseQuantity(text, unit, { allowNegative: true });
          expect(back, text).toMatchObject({ ok: true });
          // Within the digits shown: formatting rounds to `digits` significant figures.
          if (back.ok) expect(Math.abs(back.value - value) / Math.abs(value)).toBeLessThanOrEqual(0.5 * 10 ** (1 - digits) * (1 + 1e-9));
        },
      ),
      { seed: 301, numRuns: 1000 },
    );
  });
});

/**
 * Every value a number with separators could plausibly mean, worked out independently of the parser:
 * a dot is the decimal mark (the app writes it so); a comma is a decimal mark in much of Europe and a
 * thousands separator in English-speaking practice (groups of three digits after a 1–3 digit head).
 */
function plausibleReadings(number: string): Set<number> {
  const readings = new Set<number>();
  for (const commaIsDecimal of [true, false]) {
    const decimalMarks = number.split('').filter((c) => c === '.' || (commaIsDecimal && c === ',')).length;
    if (decimalMarks > 1) continue;
    const decimalAt = number.search(commaIsDecimal ? /[.,]/ : /\./);
    const whole = decimalAt === -1 ? number : number.slice(0, decimalAt);
    const fraction = decimalAt === -1 ? '' : number.slice(decimalAt + 1);
    if (!commaIsDecimal && fraction.includes(',')) continue;
    const groups = commaIsDecimal ? [whole] : whole.split(',');
    if (groups.length > 1 && !(/^\d{1,3}$/.test(groups[0]) && groups.slice(1).every((g) => /^\d{3}$/.test(g)))) continue;
    const digits = groups.join('');
    if (!/^\d*$/.test(digits) || !/^\d*$/.test(fraction) || digits + fraction === '') continue;
    readings.add(Number(`${digits || '0'}.${fraction || '0'}`));
  }
  return readings;
}

describe('no accepted text has two plausible readings (property)', () => {
  const numberText = fc.array(fc.constantFrom('0', '1', '2', '4', '7', '9', ',', '.'), { minLength: 1, maxLength: 9 }).map((chars) => chars.join(''));
  const grouped = fc
    .tuple(
      fc.integer({ min: 1, max: 999 }),
      fc.array(fc.integer({ min: 0, max: 999 }), { minLength: 1, maxLength: 3 }),
      fc.constantFrom(',', '.'),
      fc.option(fc.tuple(fc.constantFrom(',', '.'), fc.integer({ min: 0, max: 9999 }))),
    )
    .map(([head, groups, sep, tail]) => `${head}${groups.map((g) => sep + String(g).padStart(3, '0')).join('')}${tail ? tail[0] + tail[1] : ''}`);
  const suffixes: [string, QuantityUnit, number][] = [
    ['u', 'F', 1e-6],
    [' µF', 'F', 1e-6],
    ['k', 'Ω', 1e3],
    [' kΩ', 'Ω', 1e3],
    [' V', 'V', 1],
    ['', 'V', 1],
    [' ms', 's', 1e-3],
  ];

  it('an accepted number has exactly one plausible reading, and it is the one taken', () => {
    fc.assert(
      fc.property(fc.oneof(numberText, grouped), fc.constantFrom(...suffixes), (number, [suffix, unit, scale]) => {
        const parsed = parseQuantity(`${number}${suffix}`, unit, { allowZero: true });
        if (!parsed.ok) return;
        const readings = plausibleReadings(number);
        expect([...readings], `${number}${suffix}`).toHaveLength(1);
        const [reading] = readings;
        expect(Math.abs(parsed.value - reading * scale)).toBeLessThanOrEqual(1e-12 * Math.max(Math.abs(reading * scale), 1e-300));
      }),
      { seed: 1009, numRuns: 3000 },
    );
  });

  it('refuses what the old reading got wrong: a thousands separator taken for a decimal comma', () => {
    // The case that turned a failing design into "Meets every check": 2,200 µF read as 2.2 µF.
    expect(plausibleReadings('2,200')).toEqual(new Set([2200, 2.2]));
    expect(parseQuantity('2,200u', 'F').ok).toBe(false);
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
