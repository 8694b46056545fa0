/**
 * Absolute week number w = (days since Monday 1970-01-05) / 7, so that seasonality lines
 * up across cells that start on different dates.
 */
const EPOCH_MONDAY_MS = Date.UTC(1970, 0, 5);
const DAY_MS = 86_400_000;
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Parses an ISO date (YYYY-MM-DD) that must be a Monday and returns its absolute week number. */
export function absoluteWeekOf(isoDate: string): number {
  const match = ISO_DATE.exec(isoDate);
  if (match === null) throw new RangeError(`"${isoDate}" is not an ISO date (YYYY-MM-DD)`);
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  const ms = Date.UTC(year, month - 1, day);
  const check = new Date(ms);
  if (check.getUTCFullYear() !== year || check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day) {
    throw new RangeError(`"${isoDate}" is not a calendar date`);
  }
  if (check.getUTCDay() !== 1) throw new RangeError(`"${isoDate}" is not a Monday; weeks start on Mondays`);
  return Math.round((ms - EPOCH_MONDAY_MS) / DAY_MS) / 7;
}

/** The ISO date of the Monday of absolute week w. */
export function mondayOfAbsoluteWeek(week: number): string {
  if (!Number.isInteger(week)) throw new RangeError(`week must be an integer, got ${week}`);
  return new Date(EPOCH_MONDAY_MS + week * 7 * DAY_MS).toISOString().slice(0, 10);
}
