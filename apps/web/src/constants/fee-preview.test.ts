import { describe, expect, it } from "vitest";
import { feesInForceNote } from "./fee-preview.ts";

describe("fee preview note", () => {
  it("names the fees in force in words, in the listing's currency", () => {
    expect(feesInForceNote({ platformFeeBps: 800, processingFeeBps: 290, processingFixedMinor: 30 }, "USD")).toBe(
      "A preview with today's fees: 8 % to Grainyard and 2.9 % + $0.30 card processing. The exact figures appear once the listing is saved.",
    );
    expect(feesInForceNote({ platformFeeBps: 1250, processingFeeBps: 0, processingFixedMinor: 0 }, "CAD")).toContain(
      "12.5 % to Grainyard and 0 % + $0.00",
    ); // amounts as everywhere in the app (formatMoney);
  });
});
