import { describe, expect, it } from "vitest";
import { windowText } from "./mail-templates.ts";
import { timeZoneAt } from "./services/places.ts";

describe("pickup times in e-mails", () => {
  it("finds the yard's time zone from its position (tz-lookup), UTC when unknown", () => {
    // Michigan's lower peninsula keeps Eastern time (IANA tz database: America/Detroit); the demo's Lakemont sits there.
    expect(timeZoneAt(44.618, -85.402)).toBe("America/Detroit");
    expect(timeZoneAt(43.65, -79.38)).toBe("America/Toronto");
    expect(timeZoneAt(null, -85.4)).toBe("UTC");
  });

  it("writes a window in the yard's own time, with daylight saving time (IANA tz database)", () => {
    // US Eastern is UTC−5 in winter and UTC−4 from the second Sunday of March to the first Sunday of November.
    expect(windowText("2026-12-05T14:00:00.000Z", "2026-12-05T16:00:00.000Z", "America/Detroit")).toBe("Sat, 5 Dec 2026, 09:00–11:00 EST");
    expect(windowText("2026-07-04T14:00:00.000Z", "2026-07-04T15:30:00.000Z", "America/Detroit")).toBe("Sat, 4 Jul 2026, 10:00–11:30 EDT");
    expect(windowText("2026-12-05T14:00:00.000Z", "2026-12-05T16:00:00.000Z")).toBe("Sat, 5 Dec 2026, 14:00–16:00 UTC");
  });
});
