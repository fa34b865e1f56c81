import { z } from "zod";

export const componentStateSchema = z.enum(["up", "down"]);
export const healthSchema = z.object({
  status: z.enum(["ok", "degraded"]),
  components: z.object({
    database: componentStateSchema,
    storage: componentStateSchema,
    mail: componentStateSchema,
    payments: componentStateSchema,
  }),
});
export type Health = z.infer<typeof healthSchema>;
