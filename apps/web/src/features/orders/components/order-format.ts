import type { ArrivalWindow, OrderStatus } from '@underfoot/core';
import type { Area } from '@/config/paths';
import { paths } from '@/config/paths';

/** Calendar dates are YYYY-MM-DD with no time of day: format them in UTC so no time zone shifts the day. */
const shortDate = new Intl.DateTimeFormat('en-US', { weekday: 'short', month: 'short', day: 'numeric', year: 'numeric', timeZone: 'UTC' });
const longDate = new Intl.DateTimeFormat('en-US', { weekday: 'long', month: 'long', day: 'numeric', year: 'numeric', timeZone: 'UTC' });
const compactDate = new Intl.DateTimeFormat('en-US', { month: 'short', day: 'numeric', timeZone: 'UTC' });

const asDate = (isoDate: string) => new Date(`${isoDate}T00:00:00Z`);

/** "Tue, Mar 2, 2027" */
export function formatDay(isoDate: string): string {
  const date = asDate(isoDate);
  return Number.isNaN(date.getTime()) ? isoDate : shortDate.format(date);
}

/** "Tuesday, March 2, 2027" */
export function formatLongDay(isoDate: string): string {
  const date = asDate(isoDate);
  return Number.isNaN(date.getTime()) ? isoDate : longDate.format(date);
}

/** "Mar 2" for dense tables. */
export function formatCompactDay(isoDate: string): string {
  const date = asDate(isoDate);
  return Number.isNaN(date.getTime()) ? isoDate : compactDate.format(date);
}

/** "08:00–10:00" (the company's local time, as the office entered it). */
export function formatTimes(window: Pick<ArrivalWindow, 'startTime' | 'endTime'>): string {
  return `${window.startTime}–${window.endTime}`;
}

/** Today's date on this device, as YYYY-MM-DD. The server decides with the company's calendar; this only pre-fills and guides. */
export function localTodayIso(now: Date = new Date()): string {
  const y = now.getFullYear();
  const m = String(now.getMonth() + 1).padStart(2, '0');
  const d = String(now.getDate()).padStart(2, '0');
  return `${y}-${m}-${d}`;
}

export function addDaysIso(isoDate: string, days: number): string {
  const date = asDate(isoDate);
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

/** Orders the office can still schedule, reschedule or cancel. */
export const openStatuses: readonly OrderStatus[] = ['requested', 'scheduled'];

/** Where an order's page lives in each area. */
export function orderHref(area: Area, orderId: string): string {
  return paths[area].order.getHref(orderId);
}
