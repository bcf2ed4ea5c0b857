const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const utcDateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' });

/**
 * "Mar 4, 2026, 9:15 AM" in the reader's locale and time zone; the ISO text when it is not a date.
 * `utc` is for HTML the server renders, which cannot know the reader's zone: "…, 5:15 PM UTC".
 */
export function formatDateTime(iso: string, options: { utc?: boolean } = {}): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return options.utc ? `${utcDateTime.format(date)} UTC` : dateTime.format(date);
}
