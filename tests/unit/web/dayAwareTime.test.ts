/**
 * Times on the board carry their date when they are not from today in the site's zone, so an
 * alert raised yesterday evening does not read as this afternoon's (a server restarted the next
 * morning restores it). Zone rules from the IANA database through Intl (Europe/London: BST,
 * UTC+1, in June).
 */
import { describe, expect, it } from 'vitest';
import { dayAwareClockTime, dayAwareTime } from '../../../web/src/units.ts';

describe('day-aware times', () => {
  const now = Date.UTC(2026, 5, 13, 8, 0, 0); // 09:00 in London
  it('today: the time alone', () => {
    expect(dayAwareTime(Date.UTC(2026, 5, 13, 6, 30, 5), 'Europe/London', now)).toBe('07:30');
    expect(dayAwareClockTime(Date.UTC(2026, 5, 13, 6, 30, 5), 'Europe/London', now)).toBe('07:30:05');
  });
  it('yesterday in the site zone (though today in UTC terms a minute later): the date too', () => {
    expect(dayAwareTime(Date.UTC(2026, 5, 12, 22, 59, 0), 'Europe/London', now)).toBe('12 Jun, 23:59');
    expect(dayAwareTime(Date.UTC(2026, 5, 12, 23, 0, 0), 'Europe/London', now)).toBe('00:00');
  });
});
