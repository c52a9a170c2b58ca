/** The one date-and-time format: to the minute, the time zone named; fixed on the server, the viewer's after mount. */
import { describe, expect, it } from 'vitest';
import { formatWhen, formatWhenFixed } from '../../src/lib/client/when';

describe('formatWhen', () => {
  it('writes the fixed form the server and the first browser render share', () => {
    expect(formatWhenFixed('2025-03-04T09:05:00Z')).toBe('4 Mar 2025, 09:05 UTC');
    expect(formatWhenFixed(new Date('2025-12-31T23:59:59Z'))).toBe('31 Dec 2025, 23:59 UTC');
  });

  it("writes the viewer's locale and time zone, naming the zone", () => {
    expect(formatWhen('2025-03-04T09:05:00Z', 'de-DE', 'Pacific/Auckland')).toBe('4. März 2025, 22:05 GMT+13');
    expect(formatWhen('2025-07-04T09:05:00Z', 'en-US', 'America/Chicago')).toBe('Jul 4, 2025, 04:05 AM CDT');
  });

  it('answers a dash for a value that is not a date', () => {
    expect(formatWhen('not a date', 'en-GB', 'UTC')).toBe('—');
  });
});
