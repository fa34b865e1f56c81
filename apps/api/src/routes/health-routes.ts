import type { healthEndpoints } from "@grainyard/contracts";
import { withStatus, type Handlers } from "../http/endpoints.ts";
import type { HealthService } from "../services/health-service.ts";

/** /api/health: each part of the stack as up or down; 503 when any part is down. */
export function healthHandlers(health: HealthService, instanceName: string): Handlers<typeof healthEndpoints> {
  return {
    serving: async () => ({ instance: instanceName, serving: true as const }),
    health: async () => {
      const body = await health.check();
      return withStatus(body.status === "ok" ? 200 : 503, body);
    },
  };
}
