import { describe, expect, it } from "vitest";
import { reviewTimeAxis, reviewTimeLabel } from "./review-times.ts";

describe("reviewTimeAxis", () => {
  it("charts a desk that decides within the hour in minutes, with an axis of at least one minute", () => {
    // 36 s, 6 min and nothing: the old chart read 0.01 and 0.1 on a 0–0.010 "hours" axis.
    expect(reviewTimeAxis([0.01, 0.1, 0])).toEqual({ unit: "minutes", values: [0.6, 6, 0] });
  });
  it("uses hours up to two days and days beyond", () => {
    expect(reviewTimeAxis([0.5, 3.25, 47.9])).toEqual({ unit: "hours", values: [0.5, 3.3, 47.9] });
    expect(reviewTimeAxis([12, 72, 50])).toEqual({ unit: "days", values: [0.5, 3, 2.1] });
  });
  it("has a unit when no week had a decision", () => {
    expect(reviewTimeAxis([]).unit).toBe("minutes");
    expect(reviewTimeAxis([0, 0]).values).toEqual([0, 0]);
  });
});

describe("reviewTimeLabel", () => {
  it("says each median in words", () => {
    expect(reviewTimeLabel(0.005)).toBe("under a minute");
    expect(reviewTimeLabel(1 / 60)).toBe("1 minute");
    expect(reviewTimeLabel(0.2)).toBe("12 minutes");
    expect(reviewTimeLabel(1)).toBe("1 hour");
    expect(reviewTimeLabel(3.25)).toBe("3.3 hours");
    expect(reviewTimeLabel(50)).toBe("2.1 days");
  });
});
