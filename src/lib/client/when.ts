/**
 * The one way the app writes a moment for people: date and time to the minute with the time zone named
 * ("4 Mar 2025, 09:05 UTC"). The server and the browser's first render write it in `en-GB` and UTC, so the
 * HTML React hydrates matches; after mount the browser rewrites it in the viewer's locale and time zone.
 */
const OPTIONS: Intl.DateTimeFormatOptions = { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', timeZoneName: 'short' };

/** The fixed form both sides render first. */
export const SERVER_LOCALE = 'en-GB';
export const SERVER_TIME_ZONE = 'UTC';

/** `iso` in `locale` and `timeZone`; both left out: the viewer's own (call that only in the browser, after mount). */
export function formatWhen(iso: string | Date, locale?: string, timeZone?: string): string {
  const at = typeof iso === 'string' ? new Date(iso) : iso;
  if (Number.isNaN(at.getTime())) return '—';
  return new Intl.DateTimeFormat(locale, { ...OPTIONS, timeZone }).format(at);
}

/** The fixed form (server, and the browser before mount). */
export const formatWhenFixed = (iso: string | Date): string => formatWhen(iso, SERVER_LOCALE, SERVER_TIME_ZONE);

/** Rewrites every `<time data-when datetime="…">` under `root` in the viewer's locale and time zone. */
export function localiseTimes(root: ParentNode): void {
  root.querySelectorAll<HTMLTimeElement>('time[data-when]').forEach((t) => {
    t.textContent = formatWhen(t.dateTime);
  });
}
