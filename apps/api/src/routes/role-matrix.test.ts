import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/**
 * Who may do what, route by route: anonymous, buyer, sawyer (acting on their own yard),
 * other sawyer (acting on someone else's), admin. Grow this table with every new route.
 */
type ActorName = "anonymous" | "buyer" | "sawyer" | "otherSawyer" | "admin";

interface RouteCase {
  name: string;
  call: (client: BrowserClient, ids: { sawyerId: string }) => Promise<{ status: number }>;
  expected: Record<ActorName, number>;
}

const routes: RouteCase[] = [
  {
    name: "GET /api/v1/session",
    call: (c) => c.get("/api/v1/session"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /api/v1/yard",
    call: (c) => c.get("/api/v1/yard"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "PATCH /api/v1/yards/:sawyerId",
    call: (c, ids) => c.patch(`/api/v1/yards/${ids.sawyerId}`, { pickupTown: "Northshore" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  {
    name: "GET /api/v1/admin/accounts",
    call: (c) => c.get("/api/v1/admin/accounts"),
    expected: { anonymous: 401, buyer: 403, sawyer: 403, otherSawyer: 403, admin: 200 },
  },
  {
    name: "POST /api/v1/email-verification/resend",
    // Every seeded test account is verified already: signed-in people get 409, anonymous 401.
    call: (c) => c.post("/api/v1/email-verification/resend"),
    expected: { anonymous: 401, buyer: 409, sawyer: 409, otherSawyer: 409, admin: 409 },
  },
  {
    name: "POST /api/v1/accounts (while signed in)",
    call: (c) => c.post("/api/v1/accounts", { role: "buyer", email: `m-${Math.random().toString(36).slice(2)}@lakemont.test`, password: "matrix-password-ok", displayName: "Matrix" }),
    expected: { anonymous: 201, buyer: 409, sawyer: 409, otherSawyer: 409, admin: 409 },
  },
];

let ctx: TestContext;
const clients = {} as Record<ActorName, BrowserClient>;
let sawyerId = "";

beforeAll(async () => {
  ctx = await createTestContext();
  clients.anonymous = await ctx.client();
  clients.buyer = await ctx.signedInClient("buyer");
  const sawyer = await ctx.signedInClient("sawyer");
  clients.sawyer = sawyer;
  sawyerId = sawyer.account.id;
  clients.otherSawyer = await ctx.signedInClient("sawyer");
  clients.admin = await ctx.signedInClient("admin");
});
afterAll(async () => ctx?.close());

describe("role and ownership matrix", () => {
  for (const route of routes) {
    for (const actor of Object.keys(route.expected) as ActorName[]) {
      it(`${route.name} as ${actor} → ${route.expected[actor]}`, async () => {
        const res = await route.call(clients[actor], { sawyerId });
        expect(res.status).toBe(route.expected[actor]);
      });
    }
  }

  it("a sawyer's change to their own yard is saved; another sawyer's attempt changes nothing", async () => {
    const own = await clients.sawyer.patch(`/api/v1/yards/${sawyerId}`, { yardName: "Renamed Yard" });
    expect(own.body.account.yardName).toBe("Renamed Yard");
    await clients.otherSawyer.patch(`/api/v1/yards/${sawyerId}`, { yardName: "Hijacked" });
    expect((await clients.sawyer.get("/api/v1/yard")).body.account.yardName).toBe("Renamed Yard");
  });

  it("admin search finds accounts by yard name and filters by role", async () => {
    const res = await clients.admin.get("/api/v1/admin/accounts?query=Renamed&role=sawyer");
    expect(res.status).toBe(200);
    expect(res.body.accounts.map((a: { id: string }) => a.id)).toEqual([sawyerId]);
    const bad = await clients.admin.get("/api/v1/admin/accounts?role=wizard");
    expect(bad.status).toBe(422);
  });
});
