/**
 * The demo's fixed calendar. Every date is a day number counted from DEMO_START, never from
 * today, so the demo is the same whenever it is loaded.
 */
export const DEMO_START = "2023-10-01";
export const DEMO_END = "2026-09-30";

const DAY_MS = 86_400_000;
const START_MS = Date.parse(`${DEMO_START}T00:00:00Z`);

/** Days from DEMO_START (day 0) to a date given as YYYY-MM-DD; negative before the start. */
export function dayOf(isoDate: string): number {
  return Math.round((Date.parse(`${isoDate}T00:00:00Z`) - START_MS) / DAY_MS);
}

/** The last day of demo data. */
export const LAST_DAY = dayOf(DEMO_END);

export function isoDate(day: number): string {
  return new Date(START_MS + Math.floor(day) * DAY_MS).toISOString().slice(0, 10);
}

/** UTC timestamp of a day and a fractional hour, rounded to the second (same format as createdAt). */
export function isoTimestamp(day: number, hour: number): string {
  const seconds = Math.round(Math.min(Math.max(hour, 0), 23.9997) * 3600);
  return new Date(START_MS + Math.floor(day) * DAY_MS + seconds * 1000).toISOString();
}

/** 0 = Sunday … 6 = Saturday. */
export function weekdayOf(day: number): number {
  return new Date(START_MS + Math.floor(day) * DAY_MS).getUTCDay();
}

/** Calendar year of a day number. */
export function yearOfDay(day: number): number {
  return new Date(START_MS + Math.floor(day) * DAY_MS).getUTCFullYear();
}
