import type { testClockEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";

/**
 * A clock the end-to-end suite can move forward (hold periods, automatic completion), so a test
 * need not wait days. It exists only when NODE_ENV=test and GRAINYARD_TEST_CLOCK=1 (config.ts
 * refuses the flag anywhere else); otherwise createApp never mounts its route and it answers 404.
 */
export interface MovableClock {
  now: () => Date;
  advance(milliseconds: number): void;
  reset(): void;
  offsetMs(): number;
}

export function movableClock(base: () => Date = () => new Date()): MovableClock {
  let offset = 0;
  return {
    now: () => new Date(base().getTime() + offset),
    advance: (milliseconds) => {
      offset += milliseconds;
    },
    reset: () => {
      offset = 0;
    },
    offsetMs: () => offset,
  };
}

export function testClockHandlers(clock: MovableClock): Handlers<typeof testClockEndpoints> {
  const state = () => ({ now: clock.now().toISOString(), offsetDays: clock.offsetMs() / 86_400_000 });
  return {
    getTestClock: () => state(),
    moveTestClock: ({ body }) => {
      if ("reset" in body) clock.reset();
      else clock.advance(Math.round(body.advanceDays * 86_400_000));
      return state();
    },
  };
}
