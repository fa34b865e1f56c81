import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AccountEntity } from "../entities/index.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * Promoting someone to admin happens only on the server's command line (admin:create). This walks
 * every route the app registers and calls it with a body that asks for a role change, as the
 * person themself and as an admin, then checks that no role moved.
 */
interface RouteInfo {
  method: string;
  path: string;
}

/** Every method + path the Express app answers (nested routers included). */
function registeredRoutes(app: unknown): RouteInfo[] {
  const found: RouteInfo[] = [];
  const walk = (stack: unknown[]) => {
    for (const layer of stack as {
      route?: { path: string | string[]; methods: Record<string, boolean> };
      handle?: { stack?: unknown[] };
    }[]) {
      if (layer.route) {
        for (const path of ([] as string[]).concat(layer.route.path)) {
          for (const method of Object.keys(layer.route.methods)) found.push({ method: method.toUpperCase(), path });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as { router: { stack: unknown[] } }).router.stack);
  return found;
}

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ environment: { SIGN_IN_LIMIT_PER_IP: "1000" } });
}, 60_000);
afterAll(async () => ctx?.close());

describe("no web route changes a role", () => {
  it("walks every registered route with { role: 'admin' } as the person and as an admin: roles stay as they were", async () => {
    const routes = registeredRoutes(ctx.app).filter((r) => r.path.startsWith("/") && !r.path.includes("*"));
    // The app has well over fifty routes; an empty walk must not pass.
    expect(routes.length).toBeGreaterThan(50);
    const buyer = await ctx.signedInClient("buyer");
    const sawyer = await ctx.signedInClient("sawyer");
    const admin = await ctx.signedInClient("admin");
    const asks = { role: "admin", roles: ["admin"], accountRole: "admin", isAdmin: true, reason: "Asking for a promotion in a test." };

    async function callAll(client: BrowserClient, targetId: string) {
      let answered = 0;
      for (const route of routes) {
        if (route.method === "DELETE" && route.path === "/api/v1/session") continue; // would sign the caller out
        if (!route.path.startsWith("/api")) continue;
        const url = route.path.replace(/:[A-Za-z]+/g, targetId);
        const method = route.method.toLowerCase() as "get" | "post" | "patch" | "put" | "delete";
        if (!["get", "post", "patch", "put", "delete"].includes(method)) continue;
        const res = await client.agent[method](url).set("x-csrf-token", client.csrfToken).send(asks);
        if (res.status !== 404) answered += 1;
      }
      return answered;
    }

    const before = Object.fromEntries((await ctx.dataSource.getRepository(AccountEntity).find()).map((a) => [a.id, a.role]));
    expect(await callAll(buyer, buyer.account.id)).toBeGreaterThan(20);
    expect(await callAll(sawyer, sawyer.account.id)).toBeGreaterThan(20);
    expect(await callAll(admin, buyer.account.id)).toBeGreaterThan(20);
    expect(await callAll(admin, sawyer.account.id)).toBeGreaterThan(20);
    const after = Object.fromEntries((await ctx.dataSource.getRepository(AccountEntity).find()).map((a) => [a.id, a.role]));
    for (const [id, role] of Object.entries(before)) expect(after[id]).toBe(role);
    expect(after[buyer.account.id]).toBe("buyer");
    expect(after[sawyer.account.id]).toBe("sawyer");
    expect(Object.values(after).filter((role) => role === "admin")).toHaveLength(1);
  }, 120_000);
});
