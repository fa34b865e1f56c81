import { randomUUID } from "node:crypto";
import type { Role, SlabInput } from "@grainyard/contracts";
import { feeBreakdown } from "@grainyard/slab-math";
import { AccountEntity, ListingEntity, ListingSlabEntity, OrderEntity } from "../entities/index.ts";
import type { Mailer, OutgoingMail } from "../integrations/mail.ts";
import { createLogger } from "../logger.ts";
import type { Actor } from "../services/actor.ts";
import { createCheckoutService } from "../services/checkout-service.ts";
import { createOrderService } from "../services/order-service.ts";
import { createOrderReviewService } from "../services/order-review-service.ts";
import { createPayoutService } from "../services/payout-service.ts";
import { createRefundService } from "../services/refund-service.ts";
import { createBackgroundWork } from "../services/background-work.ts";
import { createMailOutbox } from "../services/mail-outbox.ts";
import { createYardService } from "../services/yard-service.ts";
import { InMemoryPayments } from "./in-memory-payments.ts";
import { expectLedgerBalanced } from "./payments-harness.ts";
import { createTestDatabase, testClock } from "./test-context.ts";

/*
 * Fast service tests: the checkout, order, refund and payout services called directly (no HTTP,
 * no webhook delivery to wait for), on a throwaway schema of the test stack's real MariaDB, with
 * the payments port and the mailer in memory. The real-stack suites in src/routes/ stay beside
 * them: they drive the official SDK against the payments fake and send real mail.
 */

/** Mail kept in memory, in the order it was sent. */
class InMemoryMailer implements Mailer {
  readonly sent: OutgoingMail[] = [];
  async send(mail: OutgoingMail) {
    this.sent.push(mail);
  }
  async isUp() {
    return true;
  }
  close() {}
  to(address: string): OutgoingMail[] {
    return this.sent.filter((mail) => mail.to === address);
  }
}

const FEES = { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 };

export async function createServiceHarness(options: { holdDays?: number; autoCompleteDays?: number } = {}) {
  const { config, dataSource, drop } = await createTestDatabase({ TAX_RATE_BPS: "500" });
  const clock = testClock();
  const payments = new InMemoryPayments();
  const mailer = new InMemoryMailer();
  const log = createLogger("silent");
  // E-mails go through the real outbox table; only the mail server at its end is in memory.
  const background = createBackgroundWork(log);
  const outbox = createMailOutbox({ dataSource, mailer, background, settings: config.outbox, log, now: clock.now });
  const checkoutConfig = { ...config.checkout, autoCompleteDays: options.autoCompleteDays ?? config.checkout.autoCompleteDays };
  const refunds = createRefundService({ dataSource, payments, log, now: clock.now });
  const payouts = createPayoutService({
    dataSource,
    payments,
    refunds,
    mail: outbox,
    config,
    holdDays: () => options.holdDays ?? 7,
    log,
    now: clock.now,
  });
  const checkout = createCheckoutService({
    dataSource,
    payments,
    refunds,
    mail: outbox,
    config: { publicUrl: config.publicUrl, checkout: checkoutConfig },
    log,
    now: clock.now,
    onAccountUpdated: (account, manager) => payouts.recordAccount(account, manager),
  });
  const orders = createOrderService({
    dataSource,
    refunds,
    mail: outbox,
    config: { ...config, checkout: checkoutConfig },
    log,
    now: clock.now,
  });
  const yard = createYardService({ dataSource });
  const reviews = createOrderReviewService({ dataSource, mail: outbox, config, now: clock.now });

  let people = 0;
  /** Someone with an account (straight in the database: these tests do not sign in). */
  async function person(role: Role): Promise<Extract<Actor, { kind: "account" }> & { email: string }> {
    people += 1;
    const id = randomUUID();
    const email = `${role}-${people}-${id.slice(0, 6)}@lakemont.test`;
    await dataSource.getRepository(AccountEntity).insert({
      id,
      email,
      passwordHash: "not-used-here",
      role,
      displayName: `${role === "sawyer" ? "Marsh Lane" : "Test"} ${role} ${people}`,
      yardName: role === "sawyer" ? `Marsh Lane Slabs ${people}` : null,
      pickupTown: role === "sawyer" ? "Lakemont" : null,
      pickupLatitude: null,
      pickupLongitude: null,
      emailVerifiedAt: new Date(),
    });
    return { kind: "account", accountId: id, role, emailVerified: true, sessionKeyHash: "service-test", email };
  }

  /** A live fixed-price listing of one slab (figures by the yard service, fees by slab-math), offered for pickup and freight. */
  async function liveListing(sawyer: Actor & { kind: "account" }, priceMinor: number): Promise<string> {
    const input: SlabInput = {
      speciesSlug: "black-walnut",
      lengthMm: 2200,
      thicknessMm: 55,
      widthStationsMm: [640, 620],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    };
    const slab = await yard.createSlab(sawyer, input);
    const fees = feeBreakdown(priceMinor, FEES);
    const listingId = randomUUID();
    await dataSource.getRepository(ListingEntity).insert({
      id: listingId,
      sawyerId: sawyer.accountId,
      title: `Walnut top ${listingId.slice(0, 4)}`,
      description: "",
      setKind: "single",
      priceMode: "fixed",
      rateMinor: priceMinor,
      currency: "USD",
      pickup: true,
      freight: true,
      status: "live",
      reviewNote: null,
      boardFeet: slab.figures.boardFeet,
      volumeM3: slab.figures.volumeM3,
      weightKg: slab.figures.weightKg,
      weightLowKg: slab.figures.weightLowKg,
      weightHighKg: slab.figures.weightHighKg,
      priceMinor,
      platformFeeMinor: fees.platformFeeMinor,
      processingFeeMinor: fees.processingFeeMinor,
      sawyerNetMinor: fees.sawyerNetMinor,
      submittedAt: clock.now(),
      publishedAt: clock.now(),
    });
    await dataSource.getRepository(ListingSlabEntity).insert({ listingId, slabId: slab.id, position: 0 });
    return listingId;
  }

  const orderOf = (id: string) => dataSource.getRepository(OrderEntity).findOneByOrFail({ id });

  /** "Buy" and pay: the order after the provider's checkout_completed event was handled. */
  async function paidOrder(buyer: Actor, listingId: string, handover: "pickup" | "freight" = "pickup") {
    const { order } = await checkout.checkout(buyer, listingId, {
      handover,
      deliveryAddress: handover === "freight" ? "12 Alder Row, Lakemont" : null,
    });
    const checkoutId = (await orderOf(order.id)).checkoutSessionId!;
    await checkout.handleEvent(payments.pay(checkoutId));
    return orderOf(order.id);
  }

  return {
    config,
    dataSource,
    clock,
    payments,
    /** E-mails delivered to an address so far, once the prompt delivery attempts have finished. */
    async mailsTo(address: string): Promise<OutgoingMail[]> {
      await background.settled();
      return mailer.to(address);
    },
    refunds,
    checkout,
    orders,
    payouts,
    reviews,
    person,
    liveListing,
    paidOrder,
    orderOf,
    netOf: (priceMinor: number) => feeBreakdown(priceMinor, FEES).sawyerNetMinor,
    ledgerBalanced: () => expectLedgerBalanced(dataSource),
    close: drop,
  };
}

export type ServiceHarness = Awaited<ReturnType<typeof createServiceHarness>>;
