// The app's one date format: the reader's locale and zone, the zone always named. The expected strings
// are those of the Unicode CLDR data that Node's ICU ships (en-GB and en-US date patterns), and the
// offsets those of the IANA time-zone rules (Berlin UTC+2 in summer, New York UTC−5 in winter).
import { describe, expect, it } from 'vitest';
import { formatWhen } from '../../shared/dates';

describe('formatWhen', () => {
  it('when an instant is shown in Berlin in summer, then it reads in local time with CEST named', () => {
    expect(formatWhen('2025-05-12T12:03:00Z', { locale: 'en-GB', timeZone: 'Europe/Berlin' })).toBe('12 May 2025, 14:03 CEST');
  });

  it('when the same instant is shown in New York in winter, then the day and the zone follow the reader', () => {
    expect(formatWhen('2025-01-12T03:03:00Z', { locale: 'en-US', timeZone: 'America/New_York' })).toBe('Jan 11, 2025, 10:03 PM EST');
  });

  it('when the reader is in UTC, then UTC is named too', () => {
    expect(formatWhen(new Date('2025-05-12T12:03:00Z'), { locale: 'en-GB', timeZone: 'UTC' })).toBe('12 May 2025, 12:03 UTC');
  });

  it('when there is no instant, then a dash stands in; text that is not a date is shown as it came', () => {
    expect(formatWhen(null)).toBe('—');
    expect(formatWhen(undefined)).toBe('—');
    expect(formatWhen('')).toBe('—');
    expect(formatWhen('not a date')).toBe('not a date');
  });
});
