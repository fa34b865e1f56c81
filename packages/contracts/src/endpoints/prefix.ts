/** Every API path lives under /api/v1, except the health check. */
export const API_PREFIX = "/api/v1";
