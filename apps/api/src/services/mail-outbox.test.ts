import { describe, expect, it } from "vitest";
import { plainReason, retryDelayMs } from "./mail-outbox.ts";

describe("the outbox's retry rules", () => {
  it("waits the first delay after one failure, twice as long after each further one, and never more than an hour", () => {
    expect([1, 2, 3, 4, 5].map((attempts) => retryDelayMs(attempts, 30_000))).toEqual([30_000, 60_000, 120_000, 240_000, 480_000]);
    expect(retryDelayMs(8, 30_000)).toBe(3_600_000); // 30 s × 2^7 = 64 min, held to the hour
    expect(retryDelayMs(40, 30_000)).toBe(3_600_000);
  });

  it("gives up at once on a refusal (SMTP 5xx), retries a busy server (4xx) and one that cannot be reached, in plain words", () => {
    expect(plainReason({ responseCode: 550 })).toEqual({ reason: "The mail server refused this e-mail (SMTP 550).", permanent: true });
    expect(plainReason({ responseCode: 451 })).toEqual({
      reason: "The mail server asked us to try again later (SMTP 451).",
      permanent: false,
    });
    expect(plainReason({ code: "ESOCKET" })).toEqual({ reason: "The mail server could not be reached.", permanent: false });
    expect(plainReason(new Error("connect ECONNREFUSED 127.0.0.1:6384"))).toEqual({
      reason: "Sending failed; the API log has the details.",
      permanent: false,
    });
  });
});
