import { describe, expect, it } from "vitest";
import { chosenSuites, SUITES, summaryExitCode } from "./test-run.ts";

describe("choosing suites (GRAINYARD_TEST_SUITES)", () => {
  it("runs every suite when unset or blank", () => {
    expect([...chosenSuites(undefined)]).toEqual([...SUITES]);
    expect([...chosenSuites("  ")]).toEqual([...SUITES]);
  });

  it("runs the named suites only, spaces allowed", () => {
    expect([...chosenSuites("many, replica")]).toEqual(["many", "replica"]);
  });

  it("refuses a name that is not a suite, so a typo never reads as a green run of nothing", () => {
    expect(() => chosenSuites("many,mnay")).toThrow(/no suite named mnay/);
  });
});

describe("the run's exit code", () => {
  const ok = { name: "web", passed: 3, failed: 0, skipped: 0, exitCode: 0, seconds: 1 };
  it("is 0 only when every suite passed something and nothing failed", () => {
    expect(summaryExitCode([ok])).toBe(0);
    expect(summaryExitCode([ok, { ...ok, failed: 1 }])).toBe(1);
    expect(summaryExitCode([ok, { ...ok, passed: 0 }])).toBe(1);
    expect(summaryExitCode([ok, { ...ok, exitCode: 2 }])).toBe(1);
  });
});
