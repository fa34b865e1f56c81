import { request as httpRequest } from "node:http";
import { request as httpsRequest } from "node:https";
import { In, type DataSource } from "typeorm";
import { AccountEntity, OrderEntity } from "../entities/index.ts";
import type { Actor } from "../services/actor.ts";
import type { CheckoutService } from "../services/checkout-service.ts";
import type { OrderReviewService } from "../services/order-review-service.ts";
import type { OrderService } from "../services/order-service.ts";
import type { PayoutService } from "../services/payout-service.ts";
import type { ReportService } from "../services/report-service.ts";
import type { DemoSale, PlannedSale } from "./lakemont-yard.ts";

/*
 * The demo's sales, made the way real ones are: the buyer's checkout through the checkout service
 * and the payments port, paid on the provider's hosted page with the test card (the payments
 * fake's page, as a buyer's browser would), the payment confirmed by asking the provider, then
 * every step through the order service — pickup windows or freight, hand-over, completion — and
 * the buyer's review and the sawyer's answer through the review service. So the ledger, the
 * balances and the payouts come out exactly as they would for real orders.
 *
 * The services run on a clock the seed moves along each order's days in the past (no e-mail is
 * sent: the seed's mailer keeps nothing). Columns the database stamps by itself (an order's and
 * the ledger's created_at) are moved onto the same days at the end.
 */

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

export interface SalesServices {
  checkout: CheckoutService;
  orders: OrderService;
  reviews: OrderReviewService;
  reports: ReportService;
  payouts: PayoutService;
  /** Sets the services' clock. */
  setClock(at: Date): void;
  autoCompleteDays: number;
}

/** Where each demo yard has buyers come (invented addresses). */
const PICKUP_ADDRESSES: Record<string, string> = {
  "yard@ridgeback-timber.test": "Ridgeback yard, gate B, 212 Tannery Road, Lakemont",
  "hello@cobblelane-slabs.test": "Cobble Lane Slabworks, 9 Cobble Lane (the green gate), East Lakemont",
  "mill@heronpoint-mill.test": "Heron Point Mill, behind the park workshop, 3 Launch Road, Heron Point",
  "woodlot@cedarhollow.test": "Solberg farm, 1480 Hollow Road, Cedar Hollow (the red barn)",
  "barn@ashgrove-slabs.test": "Ashgrove Slab Barn, 22 Station Road, Ashgrove",
  "crew@quarryridge-trees.test": "Quarry Ridge Tree & Timber, 5 Quarry Gate Road, Quarry Ridge",
  "office@millbrook-kiln.test": "Millbrook Kiln Works, loading dock 2, 60 Millrace Lane, Millbrook",
  "dock@oldharbour-sawyers.test": "Shed 4, Old Harbour sheds, Ferry Street, Lakemont",
  "hello@tamarack-lane.test": "17 Tamarack Lane (side gate), East Lakemont",
};

/** Where freight goes for each demo buyer (invented addresses). */
const DELIVERY_ADDRESSES: Record<string, string> = {
  "shop@fernhill-furniture.test": "Fernhill Furniture Shop\n77 Fernhill Road\nLakemont",
  "ana.theo@lakemont-home.test": "Ana and Theo Brandt\n31 Orchard Terrace\nLakemont",
  "studio@calloway-interiors.test": "Calloway Interiors\n8 Lantern Quay, studio 3\nLakemont",
  "sam@hollowpine-guitars.test": "Hollow Pine Guitars\n2 Quarry Gate Road, unit 6\nQuarry Ridge",
  "bea.fennimore@lakemont-home.test": "Beatrix Fennimore\n12 Weir Lane\nMillbrook",
  "corin@lakeview-fitout.test": "Lakeview Fit-out workshop\n41 Depot Street\nEast Lakemont",
  "wendel.family@lakemont-home.test": "Tomasz and Priya Wendel\n5 Birch Close\nNorthshore",
};

/** Yards that have set up payouts in the demo, and whether Grainyard has paid one out already. */
const PAYOUT_YARDS: { email: string; paidDaysAgo: number | null }[] = [
  { email: "yard@ridgeback-timber.test", paidDaysAgo: 32 },
  { email: "mill@heronpoint-mill.test", paidDaysAgo: null },
  { email: "office@millbrook-kiln.test", paidDaysAgo: 40 },
];

/** A form POST through node:http(s) (fetch refuses some local ports); answers the status. */
function postForm(url: string, fields: Record<string, string>): Promise<number> {
  const body = new URLSearchParams(fields).toString();
  const target = new URL(url);
  const send = target.protocol === "https:" ? httpsRequest : httpRequest;
  return new Promise((resolvePromise, reject) => {
    const request = send(
      target,
      {
        method: "POST",
        headers: { "content-type": "application/x-www-form-urlencoded", "content-length": Buffer.byteLength(body) },
        timeout: 15_000,
      },
      (response) => {
        response.resume();
        resolvePromise(response.statusCode ?? 0);
      },
    );
    request.on("timeout", () => request.destroy(new Error("timed out")));
    request.on("error", reject);
    request.end(body);
  });
}

const actorOf = (account: AccountEntity): Actor => ({
  kind: "account",
  accountId: account.id,
  role: account.role,
  emailVerified: true,
  sessionKeyHash: "lakemont-seed",
});

/** Ten in the morning, Lakemont time (15:00 UTC), `days` before `now`. */
function morningOf(now: Date, days: number): number {
  const day = new Date(now.getTime() - days * DAY);
  day.setUTCHours(15, 0, 0, 0);
  return day.getTime();
}

export async function seedLakemontSales(
  dataSource: DataSource,
  services: SalesServices,
  planned: PlannedSale[],
  now: Date,
): Promise<{ orders: number; reviews: number; payouts: number; skipped: string[] }> {
  const accounts = new Map((await dataSource.getRepository(AccountEntity).find()).map((a) => [a.email, a]));
  const admin = [...accounts.values()].find((a) => a.role === "admin");
  const skipped: string[] = [];
  const orderIds: string[] = [];
  let reviews = 0;
  const latest = now.getTime() - 10 * 60_000;

  for (const { listingId, title, yardEmail, sale } of [...planned].sort((a, b) => b.sale.daysAgo - a.sale.daysAgo)) {
    const buyer = accounts.get(sale.buyer);
    const sawyer = accounts.get(yardEmail);
    if (!buyer || !sawyer) {
      skipped.push(`${title}: no account for ${buyer ? yardEmail : sale.buyer}`);
      continue;
    }
    const buyerActor = actorOf(buyer);
    const sawyerActor = actorOf(sawyer);
    const t0 = morningOf(now, sale.daysAgo);
    /** Moves the clock to `at`, unless that is still to come (then the order stops where it is). */
    const at = (ms: number) => {
      if (ms > latest) return false;
      services.setClock(new Date(ms));
      return true;
    };

    at(t0);
    const { order, checkoutUrl } = await services.checkout.checkout(buyerActor, listingId, {
      handover: sale.handover,
      deliveryAddress: sale.handover === "freight" ? DELIVERY_ADDRESSES[sale.buyer] : null,
    });
    const paid = await postForm(checkoutUrl, { card: "4242 4242 4242 4242", expiry: "12 / 34", cvc: "123", email: buyer.email });
    if (paid !== 303 || (await services.checkout.reconcilePayment(order.id)) !== "handled") {
      skipped.push(`${title}: the payment did not go through (hosted page answered ${paid})`);
      continue;
    }
    orderIds.push(order.id);
    if (sale.end === "paid") continue;
    if (sale.end === "cancelled") {
      if (at(t0 + 26 * HOUR)) await services.orders.cancel(buyerActor, order.id, { reason: sale.cancelReason ?? "Plans changed." });
      continue;
    }

    // Ready: pickup windows (still to come for an order that waits on them), or freight.
    let handedOverAt: number;
    if (sale.handover === "pickup") {
      if (!at(t0 + 20 * HOUR)) continue;
      // Windows a couple of days on; for an order still waiting on its pickup, a day or more from today.
      const soonest = t0 + 68 * HOUR;
      const first = sale.end === "ready_for_pickup" ? Math.max(soonest, Math.ceil((now.getTime() + 26 * HOUR) / HOUR) * HOUR) : soonest;
      const windows = [
        { startsAt: new Date(first).toISOString(), endsAt: new Date(first + 2 * HOUR).toISOString() },
        { startsAt: new Date(first + 24 * HOUR + 5 * HOUR).toISOString(), endsAt: new Date(first + 24 * HOUR + 8 * HOUR).toISOString() },
      ];
      await services.orders.proposePickupWindows(sawyerActor, order.id, {
        windows,
        pickupAddress: PICKUP_ADDRESSES[yardEmail] ?? "At the yard",
      });
      if (sale.end === "ready_for_pickup" || !at(t0 + 26 * HOUR)) continue;
      await services.orders.choosePickupWindow(buyerActor, order.id, { startsAt: windows[0]!.startsAt });
      handedOverAt = first + HOUR;
    } else {
      if (!at(t0 + 44 * HOUR)) continue;
      await services.orders.markShipped(sawyerActor, order.id, {
        carrier: "Lakeshore Freight Lines",
        trackingReference: `LFL-${order.id.slice(0, 6).toUpperCase()}`,
      });
      if (sale.end === "shipped") continue;
      handedOverAt = t0 + 116 * HOUR;
    }
    if (!at(handedOverAt)) continue;
    await services.orders.markHandedOver(sawyerActor, order.id);
    if (sale.end === "handed_over") continue;

    // Completed: the buyer confirms, or the days after hand-over run out.
    let completedAt: number;
    if (sale.completedBy === "automatic") {
      completedAt = handedOverAt + services.autoCompleteDays * DAY + HOUR;
      if (!at(completedAt)) continue;
      await services.orders.completeDueOrders();
    } else {
      completedAt = handedOverAt + 22 * HOUR;
      if (!at(completedAt)) continue;
      await services.orders.confirmReceipt(buyerActor, order.id);
    }
    if (sale.review && at(completedAt + sale.review.daysAfter * DAY))
      reviews += await review(services, sale, buyerActor, sawyerActor, order.id, at);
  }

  // The database stamps created_at itself: move those stamps onto the demo's days.
  if (orderIds.length) {
    await dataSource.query("UPDATE buyer_order SET created_at = COALESCE(paid_at, created_at) WHERE id IN (?)", [orderIds]);
    await dataSource.query(
      `UPDATE ledger_entry e JOIN buyer_order o ON o.id = e.order_id
          SET e.created_at = CASE WHEN e.kind = 'payment' THEN o.paid_at ELSE COALESCE(o.refunded_at, o.cancelled_at, e.created_at) END
        WHERE o.id IN (?) AND e.kind IN ('payment', 'refund')`,
      [orderIds],
    );
  }
  const payouts = admin ? await payoutsFor(dataSource, services, accounts, actorOf(admin), now, orderIds) : 0;
  services.setClock(now);
  return { orders: orderIds.length, reviews, payouts, skipped };
}

async function review(
  services: SalesServices,
  sale: DemoSale,
  buyer: Actor,
  sawyer: Actor,
  orderId: string,
  at: (ms: number) => boolean,
): Promise<number> {
  const demo = sale.review!;
  const written = await services.reviews.write(buyer, orderId, {
    rating: demo.rating,
    matchedListing: demo.matched.yes,
    matchedListingComment: demo.matched.comment ?? "",
    handoverWentWell: demo.handover.yes,
    handoverComment: demo.handover.comment ?? "",
    body: demo.body ?? "",
  });
  const writtenAt = new Date(written.review!.createdAt).getTime();
  if (demo.answer && at(writtenAt + 20 * HOUR)) await services.reviews.answer(sawyer, orderId, { body: demo.answer });
  if (demo.reportedBySawyer && at(writtenAt + 30 * HOUR))
    await services.reports.create(sawyer, { targetKind: "review", targetId: written.review!.id, reason: demo.reportedBySawyer });
  return 1;
}

/**
 * Payout accounts for some yards, set up on the provider's hosted page as a sawyer would, and for
 * some an earlier payout an admin approved (what was due on that day).
 */
async function payoutsFor(
  dataSource: DataSource,
  services: SalesServices,
  accounts: Map<string, AccountEntity>,
  admin: Actor,
  now: Date,
  orderIds: string[],
): Promise<number> {
  let paid = 0;
  const seededSawyers = new Set(
    (await dataSource.getRepository(OrderEntity).find({ where: { id: In(orderIds) }, select: { sawyerId: true } })).map((o) => o.sawyerId),
  );
  for (const yard of PAYOUT_YARDS) {
    const sawyer = accounts.get(yard.email);
    if (!sawyer || !seededSawyers.has(sawyer.id)) continue;
    services.setClock(new Date(now.getTime() - 60 * DAY));
    const { url } = await services.payouts.onboardingLink(actorOf(sawyer));
    const returnUrl = new URL(url).searchParams.get("return_url") ?? "";
    await postForm(url, { name: sawyer.yardName ?? sawyer.displayName, return_url: returnUrl });
    await services.payouts.refreshAccount(actorOf(sawyer));
    if (yard.paidDaysAgo === null) continue;
    services.setClock(new Date(morningOf(now, yard.paidDaysAgo)));
    const due = (await services.payouts.due(admin)).due.find((d) => d.sawyerId === sawyer.id && d.accountState === "ready");
    if (!due) continue;
    const payout = await services.payouts.approve(admin, { sawyerId: sawyer.id, currency: due.currency, dueKey: due.dueKey });
    if (payout.status === "sent") paid += 1;
  }
  // The ledger's payout entries, onto the day the money was sent.
  await dataSource.query(
    `UPDATE ledger_entry e JOIN payout p ON p.transfer_id = e.provider_event_id
        SET e.created_at = p.sent_at WHERE e.kind = 'payout' AND p.sent_at IS NOT NULL AND p.sent_at < e.created_at`,
  );
  return paid;
}
