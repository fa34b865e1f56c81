import type { Server } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OrderEntity, PaymentEventEntity } from "../entities/index.ts";
import { liveListing } from "../test-support/live-listing.ts";
import { listenForWebhooks, startPaymentsFake, until, type TestPaymentsFake } from "../test-support/payments-harness.ts";
import { createTestContext, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * The operator desk's orders against real MariaDB and a payments fake of this suite's own (its
 * webhooks reach this suite's app through the official SDK): the order search and its keyset
 * pages, and the dashboard counting only paid orders (a declined card and a lapsed hold are not).
 */
let payments: TestPaymentsFake;
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
let admin: BrowserClient;
let ridgeback: BrowserClient & { account: { id: string; email: string } };
let cobble: BrowserClient & { account: { id: string; email: string } };
let wren: BrowserClient & { account: { id: string; email: string } };
let ada: BrowserClient & { account: { id: string; email: string } };

interface OrderRow {
  id: string;
  title: string;
  status: string;
  createdAt: string;
  parties: { buyerName: string; yardName: string | null };
}
const orders: Record<string, string> = {};

const statusOf = async (id: string) => (await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id })).status;

/** A live listing of `sawyer` bought by `buyer`; answers the order id and the payment page. */
async function buy(sawyer: BrowserClient, buyer: BrowserClient, title: string) {
  const listingId = await liveListing(sawyer, admin, { title, speciesSlug: "black-walnut", rateMinor: 80_000 });
  const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
  expect(res.status).toBe(201);
  return { orderId: res.body.order.id as string, checkoutUrl: res.body.checkoutUrl as string };
}

async function search(
  query: string,
): Promise<{ status: number; body: { orders: OrderRow[]; nextCursor: string | null; error?: { fields: Record<string, string> } } }> {
  return admin.get(`/api/v1/admin/orders${query}`);
}

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_admin_orders", webhookSecret: "whsec_admin_orders" });
  ctx = await createTestContext({ clock, environment: { ...payments.environment, SIGN_IN_LIMIT_PER_IP: "1000" } });
  let webhookUrl: string;
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  payments.fake.webhooks.options.url = webhookUrl;
  admin = await ctx.signedInClient("admin");
  ridgeback = await ctx.signedInClient("sawyer", { displayName: "Tamsin Okafor", yardName: "Ridgeback Urban Timber" });
  cobble = await ctx.signedInClient("sawyer", { displayName: "Piet Marlow", yardName: "Cobble Lane Slabworks" });
  wren = await ctx.signedInClient("buyer", { displayName: "Wren Halvorsen", email: "wren.halvorsen@lakemont.test" });
  ada = await ctx.signedInClient("buyer", { displayName: "Ada Lindqvist", email: "ada@fernhill-studio.test" });

  // Paid: Wren buys two from Ridgeback, Ada one from Cobble Lane.
  for (const [key, sawyer, buyer, title] of [
    ["walnutPaid", ridgeback, wren, "Walnut bench slab 1"],
    ["maplePaid", ridgeback, wren, "Silver maple slab 3"],
    ["elmPaid", cobble, ada, "American elm counter"],
  ] as const) {
    const { orderId, checkoutUrl } = await buy(sawyer, buyer, title);
    expect((await payOnHostedPage(checkoutUrl, "4242 4242 4242 4242")).status).toBe(303);
    await until(async () => (await statusOf(orderId)) === "paid");
    orders[key] = orderId;
  }
  // Declined and still waiting: Ada's card was refused on the payment page.
  const declined = await buy(cobble, ada, "Honey locust offcut");
  expect((await payOnHostedPage(declined.checkoutUrl, "4000 0000 0000 0002")).status).toBe(402);
  await payments.fake.webhooks.settled();
  await until(async () =>
    (await ctx.dataSource.getRepository(PaymentEventEntity).findBy({ type: "payment_failed" })).some(
      (event) => JSON.parse(event.payload).orderId === declined.orderId,
    ),
  );
  orders.declined = declined.orderId;
  // Declined, then the hold ran out: expired.
  const lapsed = await buy(ridgeback, wren, "Red oak mantel");
  expect((await payOnHostedPage(lapsed.checkoutUrl, "4000 0000 0000 0002")).status).toBe(402);
  await payments.fake.webhooks.settled();
  clock.advance(16 * 60_000);
  try {
    const app = ctx.app as unknown as { checkout: { sweepExpiredReservations(): Promise<number> } };
    expect(await app.checkout.sweepExpiredReservations()).toBeGreaterThanOrEqual(1);
  } finally {
    clock.advance(-16 * 60_000);
  }
  expect(await statusOf(lapsed.orderId)).toBe("expired");
  orders.lapsed = lapsed.orderId;
}, 120_000);

afterAll(async () => {
  if (apiServer) await new Promise((r) => apiServer.close(r));
  await payments?.close();
  await ctx?.close();
});

describe("the desk's order search", () => {
  it("finds orders by buyer name or e-mail, sawyer or yard name, slab title and order number", async () => {
    const ids = async (q: string) => {
      const res = await search(`?q=${encodeURIComponent(q)}`);
      expect(res.status).toBe(200);
      return res.body.orders.map((o) => o.id).sort();
    };
    const sorted = (...keys: string[]) => keys.map((k) => orders[k]!).sort();
    expect(await ids("wren")).toEqual(sorted("walnutPaid", "maplePaid", "lapsed"));
    expect(await ids("fernhill-studio")).toEqual(sorted("elmPaid", "declined"));
    expect(await ids("Cobble Lane")).toEqual(sorted("elmPaid", "declined"));
    expect(await ids("Tamsin")).toEqual(sorted("walnutPaid", "maplePaid", "lapsed"));
    expect(await ids("silver maple")).toEqual(sorted("maplePaid"));
    // The order number as people read it (first 8 of the id, upper case, maybe with a "#").
    const number = orders.elmPaid!.slice(0, 8).toUpperCase();
    expect(await ids(number)).toEqual(sorted("elmPaid"));
    expect(await ids(`#${number}`)).toEqual(sorted("elmPaid"));
    expect(await ids(orders.elmPaid!)).toEqual(sorted("elmPaid"));
    // LIKE's wildcards are plain characters here; nothing matches nothing.
    expect(await ids("%")).toEqual([]);
    expect(await ids("nobody by this name")).toEqual([]);
    // No words: every order, newest first (unpaid checkouts too: the desk must be able to find them).
    const all = await search("?limit=50");
    expect(all.body.orders).toHaveLength(5);
    const times = all.body.orders.map((o) => o.createdAt);
    expect([...times].sort().reverse()).toEqual(times);
    expect(all.body.nextCursor).toBeNull();
    const elm = all.body.orders.find((o) => o.id === orders.elmPaid)!;
    expect(elm).toMatchObject({
      title: "American elm counter",
      parties: { buyerName: "Ada Lindqvist", yardName: "Cobble Lane Slabworks" },
    });
  });

  it("pages by keyset: every order once, in order, with a bounded page size", async () => {
    const all = (await search("?limit=50")).body.orders.map((o) => o.id);
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const page = await search(`?limit=2${cursor ? `&cursor=${cursor}` : ""}`);
      expect(page.status).toBe(200);
      expect(page.body.orders.length).toBeLessThanOrEqual(2);
      seen.push(...page.body.orders.map((o) => o.id));
      cursor = page.body.nextCursor;
      pages += 1;
    } while (cursor);
    expect(pages).toBe(3);
    expect(seen).toEqual(all);
    // Paging a search keeps to it.
    const first = await search("?q=wren&limit=2");
    expect(first.body.orders).toHaveLength(2);
    const second = await search(`?q=wren&limit=2&cursor=${first.body.nextCursor}`);
    expect(second.body.orders).toHaveLength(1);
    expect(second.body.nextCursor).toBeNull();

    for (const bad of ["?limit=0", "?limit=51", "?limit=two", "?cursor=yesterday", `?q=${"x".repeat(101)}`]) {
      const res = await search(bad);
      expect(res.status, bad).toBe(422);
    }
    const tooMany = await search("?limit=51");
    expect(tooMany.body.error?.fields.limit).toMatch(/at most 50/);
  });

  it("is the admins' alone", async () => {
    expect((await wren.get("/api/v1/admin/orders")).status).toBe(403);
    expect((await ridgeback.get("/api/v1/admin/orders?q=wren")).status).toBe(403);
    expect((await (await ctx.client()).get("/api/v1/admin/orders")).status).toBe(401);
  });
});

describe("the dashboard's orders", () => {
  it("counts paid orders only: a declined card, an old failed payment and a lapsed hold are not orders", async () => {
    // An order stored before a declined card stopped ending the checkout still reads payment_failed.
    await ctx.dataSource.getRepository(OrderEntity).update({ id: orders.declined! }, { status: "payment_failed" });
    const dashboard = (await admin.get("/api/v1/admin/dashboard")).body.dashboard;
    expect(dashboard.ordersByState).toEqual([{ status: "paid", count: 3 }]);
    // The unpaid ones are still there for the desk to find.
    expect(await statusOf(orders.lapsed!)).toBe("expired");
    expect((await search(`?q=${orders.declined!.slice(0, 8)}`)).body.orders.map((o) => o.status)).toEqual(["payment_failed"]);
  });
});
