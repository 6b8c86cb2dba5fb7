// The one way the app shows an instant: the reader's locale, to the minute, with the time zone named,
// so "14:03" is never read in the wrong zone. (The PDF has its own UTC form: a signed document must
// read the same for every reader.)

interface WhenOptions {
  /** BCP 47 locale; the runtime's (the browser's) when left out. */
  locale?: string;
  /** IANA time zone; the runtime's when left out. */
  timeZone?: string;
}

const formats = new Map<string, Intl.DateTimeFormat>();

function formatter({ locale, timeZone }: WhenOptions): Intl.DateTimeFormat {
  const key = `${locale ?? ''}|${timeZone ?? ''}`;
  let format = formats.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, {
      year: 'numeric',
      month: 'short',
      day: 'numeric',
      hour: '2-digit',
      minute: '2-digit',
      timeZoneName: 'short',
      timeZone,
    });
    formats.set(key, format);
  }
  return format;
}

/** "12 May 2025, 14:03 CEST" (en-GB, Berlin); "—" when there is no instant. */
export function formatWhen(instant: string | Date | null | undefined, options: WhenOptions = {}): string {
  if (instant === null || instant === undefined || instant === '') return '—';
  const date = instant instanceof Date ? instant : new Date(instant);
  if (Number.isNaN(date.getTime())) return String(instant);
  return formatter(options).format(date);
}
