/**
 * Pickup times live in the yard's own IANA time zone (found from the yard town's position). This is
 * the one formatter every reader uses (the sawyer's form, the buyer's order page, receipts, e-mails),
 * so a window entered as 09:00–11:00 at the yard reads "Sat 5 Dec, 9–11 am, yard time (America/Detroit)"
 * wherever the reader's own clock is. Built on Intl, which carries the IANA tz database.
 */

interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  weekday: string;
  monthName: string;
}

const wallClockFormats = new Map<string, Intl.DateTimeFormat>();

/** The date and time on the yard's wall clock at an instant. */
function wallClockAt(instant: Date, timeZone: string): WallClock {
  let format = wallClockFormats.get(timeZone);
  if (!format) {
    format = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      weekday: "short",
    });
    wallClockFormats.set(timeZone, format);
  }
  const parts = Object.fromEntries(format.formatToParts(instant).map((part) => [part.type, part.value]));
  const month = Number(parts.month);
  return {
    year: Number(parts.year),
    month,
    day: Number(parts.day),
    hour: Number(parts.hour) % 24,
    minute: Number(parts.minute),
    weekday: parts.weekday ?? "",
    monthName: MONTHS[month - 1] ?? "",
  };
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** Whether a name is an IANA time zone this runtime knows. */
export function isKnownTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en", { timeZone });
    return true;
  } catch {
    return false;
  }
}

/** Minutes the zone's clock is ahead of UTC at an instant (−300 for US Eastern in winter). */
function offsetMinutes(instant: number, timeZone: string): number {
  const clock = wallClockAt(new Date(instant), timeZone);
  const asUtc = Date.UTC(clock.year, clock.month - 1, clock.day, clock.hour, clock.minute);
  return Math.round((asUtc - Math.floor(instant / 60_000) * 60_000) / 60_000);
}

/**
 * The instant at which the yard's clock shows a day ("2026-12-05") and a time ("09:00"). A time the
 * clock skips (spring forward) lands an hour later, as a wall clock would read it; a time it shows
 * twice (fall back) is the first of the two. Null for a malformed day or time.
 */
export function yardTimeToInstant(day: string, time: string, timeZone: string): Date | null {
  const dayMatch = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  const timeMatch = /^(\d{2}):(\d{2})$/.exec(time);
  if (!dayMatch || !timeMatch) return null;
  const [year, month, date] = [Number(dayMatch[1]), Number(dayMatch[2]), Number(dayMatch[3])];
  const [hour, minute] = [Number(timeMatch[1]), Number(timeMatch[2])];
  if (month < 1 || month > 12 || date < 1 || date > 31 || hour > 23 || minute > 59) return null;
  const asUtc = Date.UTC(year, month - 1, date, hour, minute);
  // The offset a few hours either side of the wanted time: the earlier reading wins where the clock
  // shows the time twice; where neither fits (a skipped hour) the later offset moves it forward.
  const before = offsetMinutes(asUtc - 12 * 3_600_000, timeZone);
  const after = offsetMinutes(asUtc + 12 * 3_600_000, timeZone);
  for (const offset of [before, after]) {
    const candidate = asUtc - offset * 60_000;
    if (offsetMinutes(candidate, timeZone) === offset) return new Date(candidate);
  }
  return new Date(asUtc - before * 60_000);
}

/** The yard's day ("2026-12-05") and time ("09:00") at an instant: what the sawyer's form shows. */
export function instantToYardTime(instant: string | Date, timeZone: string): { day: string; time: string } {
  const clock = wallClockAt(new Date(instant), timeZone);
  const pad = (n: number) => String(n).padStart(2, "0");
  return { day: `${clock.year}-${pad(clock.month)}-${pad(clock.day)}`, time: `${pad(clock.hour)}:${pad(clock.minute)}` };
}

/** "9", "9:30", "12" (noon or midnight): the hour on a 12-hour clock, minutes only when not on the hour. */
function clockText(clock: WallClock): string {
  const hour = clock.hour % 12 === 0 ? 12 : clock.hour % 12;
  return clock.minute ? `${hour}:${String(clock.minute).padStart(2, "0")}` : String(hour);
}
const halfOfDay = (clock: WallClock) => (clock.hour < 12 ? "am" : "pm");
const dayText = (clock: WallClock) => `${clock.weekday} ${clock.day} ${clock.monthName}`;

/** The zone as readers see it after a window: "yard time (America/Detroit)". */
export function yardTimeZoneLabel(timeZone: string): string {
  return `yard time (${timeZone})`;
}

/**
 * One pickup window in the yard's time: "Sat 5 Dec, 9–11 am, yard time (America/Detroit)",
 * "Sat 5 Dec, 11:30 am–1 pm, …", and across midnight "Sat 5 Dec, 10 pm – Sun 6 Dec, 1 am, …".
 */
export function formatPickupWindow(window: { startsAt: string | Date; endsAt: string | Date }, timeZone: string): string {
  const start = wallClockAt(new Date(window.startsAt), timeZone);
  const end = wallClockAt(new Date(window.endsAt), timeZone);
  const sameDay = start.year === end.year && start.month === end.month && start.day === end.day;
  let range: string;
  if (!sameDay) range = `${dayText(start)}, ${clockText(start)} ${halfOfDay(start)} – ${dayText(end)}, ${clockText(end)} ${halfOfDay(end)}`;
  else if (halfOfDay(start) === halfOfDay(end)) range = `${dayText(start)}, ${clockText(start)}–${clockText(end)} ${halfOfDay(end)}`;
  else range = `${dayText(start)}, ${clockText(start)} ${halfOfDay(start)}–${clockText(end)} ${halfOfDay(end)}`;
  return `${range}, ${yardTimeZoneLabel(timeZone)}`;
}
