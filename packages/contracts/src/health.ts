import { z } from "zod";

export const componentStateSchema = z.enum(["up", "down"]);
/** One API instance's own answer to the load balancer: it takes requests (nothing shared is asked). */
export const servingSchema = z.object({ instance: z.string(), serving: z.literal(true) });
export type Serving = z.infer<typeof servingSchema>;

export const healthSchema = z.object({
  status: z.enum(["ok", "degraded"]),
  components: z.object({
    database: componentStateSchema,
    storage: componentStateSchema,
    mail: componentStateSchema,
    payments: componentStateSchema,
  }),
  /** When degraded: the parts that are down, in plain words ("Down just now: photo storage."). */
  message: z.string().optional(),
});
export type Health = z.infer<typeof healthSchema>;
