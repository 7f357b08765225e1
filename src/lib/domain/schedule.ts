/**
 * The installers' schedule: booked visits grouped by when they are due. Weeks run Monday to
 * Sunday (ISO 8601 weeks). Days are ISO calendar dates (YYYY-MM-DD); `today` is passed in.
 */
import type { PlanState } from './plan-state';

export interface VisitTiming {
  scheduledFor: string;
  state: PlanState;
}

export type VisitGroup = 'past-due' | 'this-week' | 'later';

export const VISIT_GROUP_LABELS: Record<VisitGroup, string> = {
  'past-due': 'Past due',
  'this-week': 'This week',
  later: 'Later',
};

const DAY_MS = 86_400_000;
const dayNumber = (iso: string) => Math.floor(Date.parse(`${iso}T00:00:00Z`) / DAY_MS);
const isoOf = (day: number) => new Date(day * DAY_MS).toISOString().slice(0, 10);

/** Monday and Sunday of the ISO week holding `today`. */
export function getWeekOf(today: string): { monday: string; sunday: string } {
  const day = dayNumber(today);
  // 1970-01-01 was a Thursday: day 0 → weekday index 3 when Monday is 0.
  const weekday = (((day + 3) % 7) + 7) % 7;
  return { monday: isoOf(day - weekday), sunday: isoOf(day - weekday + 6) };
}

/** A booked visit whose day has passed and that is still not installed. */
export function isPastDue(visit: VisitTiming, today: string): boolean {
  return visit.state === 'scheduled' && visit.scheduledFor < today;
}

/**
 * The period a visit belongs to: past due while it waits after its day; an installed visit stays
 * in the period it was due in (past due when that was before this week).
 */
export function getVisitGroup(visit: VisitTiming, today: string): VisitGroup {
  const { monday, sunday } = getWeekOf(today);
  if (isPastDue(visit, today) || visit.scheduledFor < monday) return 'past-due';
  return visit.scheduledFor <= sunday ? 'this-week' : 'later';
}

/**
 * Visits in groups, in the order an installer works through them: past due first (oldest
 * first), then this week's, then later ones, each by day; empty groups are left out.
 */
export function groupVisits<T extends VisitTiming>(visits: readonly T[], today: string): Array<{ group: VisitGroup; visits: T[] }> {
  const order: VisitGroup[] = ['past-due', 'this-week', 'later'];
  const sorted = [...visits].sort((a, b) => a.scheduledFor.localeCompare(b.scheduledFor));
  return order.map((group) => ({ group, visits: sorted.filter((v) => getVisitGroup(v, today) === group) })).filter((g) => g.visits.length > 0);
}

/** Whole days from today to the visit (negative when it has passed). */
export function daysUntil(visit: Pick<VisitTiming, 'scheduledFor'>, today: string): number {
  return dayNumber(visit.scheduledFor) - dayNumber(today);
}
