import { describe, expect, it } from "vitest";
import { formatPickupWindow, instantToYardTime, isKnownTimeZone, yardTimeToInstant } from "./pickup-times.ts";

// Offsets from the IANA tz database: US Central is UTC−6 in winter (CST) and UTC−5 in summer (CDT);
// in 2026 summer time runs from Sunday 8 March, 02:00 local, to Sunday 1 November, 02:00 local
// (the second Sunday of March and the first Sunday of November, US Energy Policy Act of 2005).
const CHICAGO = "America/Chicago";

describe("formatPickupWindow", () => {
  it("writes a window in the yard's time with the zone's name, whatever the reader's clock", () => {
    expect(formatPickupWindow({ startsAt: "2026-12-05T15:00:00.000Z", endsAt: "2026-12-05T17:00:00.000Z" }, CHICAGO)).toBe(
      "Sat 5 Dec, 9–11 am, yard time (America/Chicago)",
    );
    // The same instants at a yard in Michigan (US Eastern, UTC−5 in December).
    expect(formatPickupWindow({ startsAt: "2026-12-05T15:00:00.000Z", endsAt: "2026-12-05T17:00:00.000Z" }, "America/Detroit")).toBe(
      "Sat 5 Dec, 10 am–12 pm, yard time (America/Detroit)",
    );
  });

  it("shows minutes only when off the hour, and a window over midnight with both days", () => {
    expect(formatPickupWindow({ startsAt: "2026-12-05T17:30:00.000Z", endsAt: "2026-12-05T19:00:00.000Z" }, CHICAGO)).toBe(
      "Sat 5 Dec, 11:30 am–1 pm, yard time (America/Chicago)",
    );
    expect(formatPickupWindow({ startsAt: "2026-12-06T04:00:00.000Z", endsAt: "2026-12-06T07:15:00.000Z" }, CHICAGO)).toBe(
      "Sat 5 Dec, 10 pm – Sun 6 Dec, 1:15 am, yard time (America/Chicago)",
    );
  });

  it("keeps 9–11 am on the days summer time ends and starts (offset changes overnight)", () => {
    // Saturday 31 October 2026 is still CDT (UTC−5); Sunday 1 November is CST (UTC−6) from 02:00.
    expect(formatPickupWindow({ startsAt: "2026-10-31T14:00:00.000Z", endsAt: "2026-10-31T16:00:00.000Z" }, CHICAGO)).toBe(
      "Sat 31 Oct, 9–11 am, yard time (America/Chicago)",
    );
    expect(formatPickupWindow({ startsAt: "2026-11-01T15:00:00.000Z", endsAt: "2026-11-01T17:00:00.000Z" }, CHICAGO)).toBe(
      "Sun 1 Nov, 9–11 am, yard time (America/Chicago)",
    );
    // A window over the change itself: 00:30 CDT to 03:00 CST is three and a half real hours.
    expect(formatPickupWindow({ startsAt: "2026-11-01T05:30:00.000Z", endsAt: "2026-11-01T09:00:00.000Z" }, CHICAGO)).toBe(
      "Sun 1 Nov, 12:30–3 am, yard time (America/Chicago)",
    );
    // Sunday 8 March 2026 from 02:00 is CDT.
    expect(formatPickupWindow({ startsAt: "2026-03-08T14:00:00.000Z", endsAt: "2026-03-08T16:00:00.000Z" }, CHICAGO)).toBe(
      "Sun 8 Mar, 9–11 am, yard time (America/Chicago)",
    );
  });
});

describe("yardTimeToInstant", () => {
  it("reads a day and time on the yard's clock as the instant it is, on either side of a change", () => {
    expect(yardTimeToInstant("2026-12-05", "09:00", CHICAGO)?.toISOString()).toBe("2026-12-05T15:00:00.000Z");
    expect(yardTimeToInstant("2026-10-31", "09:00", CHICAGO)?.toISOString()).toBe("2026-10-31T14:00:00.000Z");
    expect(yardTimeToInstant("2026-11-01", "09:00", CHICAGO)?.toISOString()).toBe("2026-11-01T15:00:00.000Z");
    expect(yardTimeToInstant("2026-03-08", "09:00", CHICAGO)?.toISOString()).toBe("2026-03-08T14:00:00.000Z");
    expect(yardTimeToInstant("2026-07-04", "14:30", "Europe/Berlin")?.toISOString()).toBe("2026-07-04T12:30:00.000Z");
  });

  it("takes the first of a time shown twice, moves a skipped time an hour on, and refuses nonsense", () => {
    // 01:30 on 1 November 2026 happens first in CDT (06:30 UTC), then in CST (07:30 UTC).
    expect(yardTimeToInstant("2026-11-01", "01:30", CHICAGO)?.toISOString()).toBe("2026-11-01T06:30:00.000Z");
    // 02:30 on 8 March 2026 never shows on a Chicago clock; 03:30 CDT is 08:30 UTC.
    expect(yardTimeToInstant("2026-03-08", "02:30", CHICAGO)?.toISOString()).toBe("2026-03-08T08:30:00.000Z");
    expect(yardTimeToInstant("2026-13-01", "09:00", CHICAGO)).toBeNull();
    expect(yardTimeToInstant("2026-12-05", "9am", CHICAGO)).toBeNull();
  });

  it("round-trips through instantToYardTime", () => {
    expect(instantToYardTime("2026-11-01T15:00:00.000Z", CHICAGO)).toEqual({ day: "2026-11-01", time: "09:00" });
    expect(instantToYardTime("2026-12-06T05:45:00.000Z", CHICAGO)).toEqual({ day: "2026-12-05", time: "23:45" });
  });

  it("knows IANA zone names", () => {
    expect(isKnownTimeZone("America/Detroit")).toBe(true);
    expect(isKnownTimeZone("Lakemont/Harbour")).toBe(false);
  });
});
