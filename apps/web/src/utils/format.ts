const dateFormat = new Intl.DateTimeFormat("en", { dateStyle: "medium" });
/** A calendar date ("2025-03-12") is the same day everywhere: read and shown in UTC. */
const calendarDateFormat = new Intl.DateTimeFormat("en", { dateStyle: "medium", timeZone: "UTC" });

/** "12 Mar 2025"-style dates; an unreadable date is shown as it came. */
export function formatDate(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return (/^\d{4}-\d{2}-\d{2}$/.test(iso) ? calendarDateFormat : dateFormat).format(date);
}
