const dateFormat = new Intl.DateTimeFormat("en", { dateStyle: "medium" });

/** "12 Mar 2025"-style dates; an unreadable date is shown as it came. */
export function formatDate(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : dateFormat.format(date);
}
