import { refundShares } from "@grainyard/slab-math";
import type { LedgerEntryEntity, OrderEntity } from "../entities/index.ts";

type Figures = Pick<
  OrderEntity,
  "id" | "currency" | "totalMinor" | "platformFeeMinor" | "processingFeeMinor" | "taxMinor" | "sawyerNetMinor" | "sawyerId"
>;

/**
 * The money of a paid order in the double-entry ledger: what the provider holds for us on one
 * side; the platform fee, card processing, tax and the sawyer's net on the other. Sums to zero,
 * because the order's figures were split by slab-math (price = fee + processing + net) and the
 * total is price + tax.
 */
export function saleEntries(order: Figures, kind: string, sourceId: string | null): Partial<LedgerEntryEntity>[] {
  const entries = [
    { account: "provider_clearing", amountMinor: order.totalMinor },
    { account: "platform_fees", amountMinor: -order.platformFeeMinor },
    { account: "processing_fees", amountMinor: -order.processingFeeMinor },
    { account: "tax_payable", amountMinor: -order.taxMinor },
    { account: `sawyer:${order.sawyerId}`, amountMinor: -order.sawyerNetMinor },
  ].filter((e) => e.amountMinor !== 0);
  return entries.map((e) => ({ ...e, orderId: order.id, currency: order.currency, kind, providerEventId: sourceId }));
}

/** A full refund undoes the sale entry by entry: every account back to where it was, still summing to zero. */
export function reversalEntries(order: Figures, sourceId: string | null): Partial<LedgerEntryEntity>[] {
  return saleEntries(order, "refund", sourceId).map((e) => ({ ...e, amountMinor: -(e.amountMinor as number) }));
}

/**
 * A part (or all) of what the buyer paid going back for a dispute: the provider pays it out, and
 * tax, platform fee, card processing and the sawyer's share each give back their part in
 * proportion (slab-math's `refundShares`, so the parts add up to the amount exactly).
 */
export function disputeRefundEntries(
  order: Figures,
  amountMinor: number,
  sourceId: string,
): { entries: Partial<LedgerEntryEntity>[]; shares: Record<"tax" | "platformFee" | "processing" | "sawyerNet", number> } {
  const shares = refundShares(
    { tax: order.taxMinor, platformFee: order.platformFeeMinor, processing: order.processingFeeMinor, sawyerNet: order.sawyerNetMinor },
    amountMinor,
  );
  const entries = [
    { account: "provider_clearing", amountMinor: -amountMinor },
    { account: "tax_payable", amountMinor: shares.tax },
    { account: "platform_fees", amountMinor: shares.platformFee },
    { account: "processing_fees", amountMinor: shares.processing },
    { account: `sawyer:${order.sawyerId}`, amountMinor: shares.sawyerNet },
  ].filter((e) => e.amountMinor !== 0);
  return {
    entries: entries.map((e) => ({ ...e, orderId: order.id, currency: order.currency, kind: "dispute_refund", providerEventId: sourceId })),
    shares,
  };
}
