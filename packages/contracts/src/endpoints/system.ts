import { z } from "zod";
import { endpoint } from "../endpoint.ts";
import { healthSchema, servingSchema } from "../health.ts";

/** Whether each part of the stack is up; 503 when any part is down. */
export const healthEndpoints = {
  health: endpoint({
    method: "GET",
    path: "/api/health",
    summary: "Each part of the stack as up or down (503 when any is down).",
    access: "anyone",
    answer: healthSchema,
    sessionFree: true,
  }),
  serving: endpoint({
    method: "GET",
    path: "/api/health/serving",
    summary:
      "The load balancer's check of one instance: 200 while it takes requests. Shared parts (database, storage, mail, payments) are not asked: all instances share them, and taking every instance out would turn a degraded site into a dead one.",
    access: "anyone",
    answer: servingSchema,
    sessionFree: true,
  }),
} as const;

export const testClockSchema = z.union([
  z.object({
    advanceDays: z
      .number({ error: "Give the days to move forward." })
      .positive("Move the clock forward only.")
      .max(365, "At most 365 days at a time."),
  }),
  z.object({ reset: z.literal(true) }),
]);
const clockStateSchema = z.object({ now: z.string(), offsetDays: z.number() });

/**
 * The end-to-end stack's movable clock (hold periods, automatic completion), so a test need not
 * wait days. Mounted only with NODE_ENV=test and GRAINYARD_TEST_CLOCK=1; elsewhere it is a 404.
 */
export const testClockEndpoints = {
  getTestClock: endpoint({
    method: "GET",
    path: "/api/_test/clock",
    summary: "The API's clock and how far it was moved.",
    access: "anyone",
    answer: clockStateSchema,
    testOnly: true,
  }),
  moveTestClock: endpoint({
    method: "POST",
    path: "/api/_test/clock",
    summary: "Move the API's clock forward, or back to real time.",
    access: "anyone",
    body: testClockSchema,
    answer: clockStateSchema,
    testOnly: true,
    csrfFree: true,
  }),
} as const;
