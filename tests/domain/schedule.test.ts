import { describe, expect, it } from 'vitest';
import { daysUntil, getVisitGroup, getWeekOf, groupVisits, isPastDue } from '../../src/lib/domain/schedule';

// ISO 8601 weeks run Monday to Sunday. 2026-12-02 is a Wednesday (checked against a calendar).

describe('weeks', () => {
  it.each([
    ['2026-12-02', '2026-11-30', '2026-12-06'],
    ['2026-11-30', '2026-11-30', '2026-12-06'],
    ['2026-12-06', '2026-11-30', '2026-12-06'],
    ['2027-01-01', '2026-12-28', '2027-01-03'],
    ['1969-12-31', '1969-12-29', '1970-01-04'],
  ])('the week of %s runs %s to %s', (today, monday, sunday) => {
    expect(getWeekOf(today)).toEqual({ monday, sunday });
  });
});

describe('visit groups', () => {
  const today = '2026-12-02';
  it('marks a scheduled visit before today past due, but not an installed one', () => {
    expect(isPastDue({ scheduledFor: '2026-12-01', state: 'scheduled' }, today)).toBe(true);
    expect(isPastDue({ scheduledFor: '2026-12-02', state: 'scheduled' }, today)).toBe(false);
    expect(isPastDue({ scheduledFor: '2026-12-01', state: 'installed' }, today)).toBe(false);
  });

  it.each([
    ['2026-11-20', 'scheduled', 'past-due'],
    ['2026-12-02', 'scheduled', 'this-week'],
    ['2026-12-06', 'scheduled', 'this-week'],
    ['2026-12-07', 'scheduled', 'later'],
    ['2026-12-01', 'installed', 'this-week'],
    ['2026-11-27', 'installed', 'past-due'],
  ] as const)('a visit on %s (%s) is %s', (scheduledFor, state, group) => {
    expect(getVisitGroup({ scheduledFor, state }, today)).toBe(group);
  });

  it('orders groups past due, this week, later, each by day, and leaves empty groups out', () => {
    const visits = [
      { id: 'a', scheduledFor: '2026-12-10', state: 'scheduled' as const },
      { id: 'b', scheduledFor: '2026-12-03', state: 'scheduled' as const },
      { id: 'c', scheduledFor: '2026-11-28', state: 'scheduled' as const },
      { id: 'd', scheduledFor: '2026-12-02', state: 'scheduled' as const },
      { id: 'e', scheduledFor: '2026-11-25', state: 'scheduled' as const },
    ];
    const groups = groupVisits(visits, today);
    expect(groups.map((g) => [g.group, g.visits.map((v) => v.id)])).toEqual([
      ['past-due', ['e', 'c']],
      ['this-week', ['d', 'b']],
      ['later', ['a']],
    ]);
    expect(groupVisits(visits.slice(0, 2), today).map((g) => g.group)).toEqual(['this-week', 'later']);
  });

  it('counts days to a visit', () => {
    expect(daysUntil({ scheduledFor: '2026-12-05' }, today)).toBe(3);
    expect(daysUntil({ scheduledFor: '2026-11-30' }, today)).toBe(-2);
    expect(daysUntil({ scheduledFor: '2027-01-01' }, today)).toBe(30);
  });
});
