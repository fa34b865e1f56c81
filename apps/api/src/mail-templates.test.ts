import { describe, expect, it } from "vitest";
import { orderStepMail, payoutSentMail } from "./mail-templates.ts";
import { timeZoneAt } from "./services/places.ts";

const order = {
  id: "o1",
  title: "Black cherry top",
  currency: "USD",
  priceMinor: 30_000,
  taxMinor: 0,
  totalMinor: 30_000,
  sawyerNetMinor: 27_000,
  platformFeeMinor: 2_000,
  processingFeeMinor: 1_000,
  handover: "pickup" as const,
  deliveryAddress: null,
  slabSnapshot: [],
  pickupWindows: null,
  pickupAddress: null,
  pickupStartsAt: null,
  pickupEndsAt: null,
  carrier: null,
  trackingReference: null,
  handedOverAt: new Date("2026-12-05T15:00:00Z"),
  completedBy: "automatic" as const,
  cancelledBy: null,
  cancelReason: null,
  status: "handed_over",
};
const parties = { buyerName: "Ana and Theo Brandt", yardName: "Cobble Lane Slabworks", pickupTown: "Lakemont", yardTimeZone: "UTC" };

describe("pickup times in e-mails", () => {
  it("finds the yard's time zone from its position (tz-lookup), UTC when unknown", () => {
    // Michigan's lower peninsula keeps Eastern time (IANA tz database: America/Detroit); the demo's Lakemont sits there.
    expect(timeZoneAt(44.618, -85.402)).toBe("America/Detroit");
    expect(timeZoneAt(43.65, -79.38)).toBe("America/Toronto");
    expect(timeZoneAt(null, -85.4)).toBe("UTC");
  });

  it("writes a window in the yard's own time with the shared formatter, with daylight saving time (IANA tz database)", () => {
    // US Eastern is UTC−5 in winter and UTC−4 from the second Sunday of March to the first Sunday of November.
    const at = (startsAt: string, endsAt: string, timeZone: string) =>
      orderStepMail(
        { email: "b@x.test", displayName: "B" },
        "buyer",
        "pickup_window_chosen",
        { ...order, pickupStartsAt: new Date(startsAt), pickupEndsAt: new Date(endsAt), pickupAddress: "Gate 2" },
        { ...parties, yardTimeZone: timeZone },
        "http://127.0.0.1/orders/o1",
        7,
      ).text;
    expect(at("2026-12-05T14:00:00.000Z", "2026-12-05T16:00:00.000Z", "America/Detroit")).toContain(
      "Sat 5 Dec, 9–11 am, yard time (America/Detroit)",
    );
    expect(at("2026-07-04T14:00:00.000Z", "2026-07-04T15:30:00.000Z", "America/Detroit")).toContain(
      "Sat 4 Jul, 10–11:30 am, yard time (America/Detroit)",
    );
    expect(at("2026-12-05T14:00:00.000Z", "2026-12-05T16:00:00.000Z", "UTC")).toContain("Sat 5 Dec, 2–4 pm, yard time (UTC)");
  });
});

describe("counts in e-mails", () => {
  const buyer = { email: "ana.theo@lakemont-home.test", displayName: "Ana and Theo Brandt" };

  it("says 1 day and 14 days, never 1 days", () => {
    expect(orderStepMail(buyer, "buyer", "handed_over", order, parties, "http://x/o1", 1).text).toContain(
      "by itself 1 day after hand-over",
    );
    expect(orderStepMail(buyer, "buyer", "handed_over", order, parties, "http://x/o1", 14).text).toContain(
      "by itself 14 days after hand-over",
    );
    expect(orderStepMail(buyer, "buyer", "completed", { ...order, status: "completed" }, parties, "http://x/o1", 1).text).toContain(
      "1 day has passed since hand-over",
    );
  });

  it("counts the orders of a payout", () => {
    const sawyer = { email: "hello@cobblelane-slabs.test", displayName: "Cobble Lane Slabworks" };
    expect(payoutSentMail(sawyer, { amountMinor: 27_000, currency: "USD" }, 1, "http://x").text).toContain("for 1 order.");
    expect(payoutSentMail(sawyer, { amountMinor: 54_000, currency: "USD" }, 2, "http://x").text).toContain("for 2 orders.");
  });
});
