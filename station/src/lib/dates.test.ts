import { describe, expect, it } from 'vitest';
import { clockText, dateTimeText, dayText } from './dates';

describe('dates', () => {
  it('shows year, month and day in that order and a 24-hour clock', () => {
    const local = new Date(2026, 0, 5, 17, 4, 9).toISOString();
    expect(dateTimeText(local)).toBe('2026-01-05 17:04');
    expect(dayText(local)).toBe('2026-01-05');
    expect(clockText(local)).toBe('17:04:09');
  });

  it('shows a UTC day for figures grouped by UTC day', () => {
    expect(dayText('2026-12-31T23:30:00.000Z', { utc: true })).toBe('2026-12-31');
  });

  it('shows a dash for a missing or unreadable time', () => {
    expect(dateTimeText(null)).toBe('\u2013');
    expect(dayText('not a time')).toBe('\u2013');
  });
});
