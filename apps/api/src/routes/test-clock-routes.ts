import { Router } from "express";
import { z } from "zod";
import { parse } from "../http/context.ts";

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

const clockMoveSchema = z.union([
  z.object({
    advanceDays: z
      .number({ error: "Give the days to move forward." })
      .positive("Move the clock forward only.")
      .max(365, "At most 365 days at a time."),
  }),
  z.object({ reset: z.literal(true) }),
]);

export function testClockRoutes(clock: MovableClock) {
  const router = Router();
  const state = () => ({ now: clock.now().toISOString(), offsetDays: clock.offsetMs() / 86_400_000 });
  router.get("/clock", (_req, res) => {
    res.json(state());
  });
  router.post("/clock", (req, res) => {
    const move = parse(clockMoveSchema, req.body);
    if ("reset" in move) clock.reset();
    else clock.advance(Math.round(move.advanceDays * 86_400_000));
    res.json(state());
  });
  return router;
}
