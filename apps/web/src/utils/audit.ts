/**
 * The audit log in words: one sentence per entry ("Wren approved 'Silver maple slab 3' by
 * Ridgeback Urban Timber"), built here and nowhere else, and its before/after as rows of a table.
 * The API records ids and JSON; it also answers who acted and what the entry is about by name.
 */
import type { AuditEntry } from "@grainyard/contracts";
import { formatMoney } from "@grainyard/slab-math";

/** Every action the API records, with its name for the log's filter. */
export const auditActionLabels: Record<string, string> = {
  "listing.approve": "Listing approved",
  "listing.send_back": "Listing sent back",
  "listing.reject": "Listing rejected",
  "listing.take_down": "Listing taken down",
  "report.dismiss": "Report dismissed",
  "report.take_down": "Report: listing taken down",
  "report.suspend": "Report: account suspended",
  "report.hide_review": "Report: review hidden",
  "review.hide": "Review hidden",
  "review.show": "Review shown again",
  "account.suspend": "Account suspended",
  "account.restore": "Account restored",
  "account.promote": "Made an admin",
  "account.create_admin": "Admin account created",
  "second_factor.on": "Second factor turned on",
  "second_factor.off": "Second factor turned off",
  "second_factor.recovery_code_used": "Recovery code used",
  "yard.update": "Yard details changed",
  "settings.update": "Settings changed",
  "payout.approve": "Payout approved",
  "order.dispute_refund": "Dispute refund",
  "email.resend": "E-mail sent again",
};

const quoted = (name: string | null, fallback: string) => (name ? `‘${name}’` : fallback);
const numberOf = (value: unknown): number | null => (typeof value === "number" && Number.isFinite(value) ? value : null);
const field = (state: unknown, key: string): unknown =>
  state && typeof state === "object" && !Array.isArray(state) ? (state as Record<string, unknown>)[key] : undefined;

/** The entry as one sentence: who did what to which thing, by its name. */
export function auditSentence(entry: AuditEntry): string {
  const who = entry.actorName;
  const { name, owner } = entry.subject;
  const by = owner ? ` by ${owner}` : "";
  const listing = `${quoted(name, "a listing")}${by}`;
  const account = name ?? "an account";
  const self = entry.actorId !== null && entry.actorId === entry.targetId;
  const reportOn = name ? `a report on ${quoted(name, "")}${by}` : owner ? `a report about ${owner}` : "a report";
  switch (entry.action) {
    case "listing.approve":
      return `${who} approved ${listing}`;
    case "listing.send_back":
      return `${who} sent ${listing} back for changes`;
    case "listing.reject":
      return `${who} rejected ${listing}`;
    case "listing.take_down":
      return `${who} took down ${listing}`;
    case "report.dismiss":
      return `${who} dismissed ${reportOn}`;
    case "report.take_down":
      return `${who} took down ${quoted(name, "a listing")}${by} after a report`;
    case "report.suspend":
      return `${who} suspended ${owner ?? "an account"} after ${name ? `a report on ${quoted(name, "")}` : "a report"}`;
    case "report.hide_review":
      return `${who} hid a review${owner ? ` about ${owner}` : ""} after a report`;
    case "review.hide":
      return `${who} hid ${owner ? `${owner}’s review` : "a review"}${name ? ` of ${quoted(name, "")}` : ""}`;
    case "review.show":
      return `${who} showed ${owner ? `${owner}’s review` : "a review"}${name ? ` of ${quoted(name, "")}` : ""} again`;
    case "account.suspend":
      return `${who} suspended ${account}`;
    case "account.restore":
      return `${who} restored ${account}`;
    case "account.promote":
      return `${who} made ${account} an admin`;
    case "account.create_admin": {
      const email = field(entry.after, "email");
      return `${who} created the admin account ${name ?? (typeof email === "string" ? email : "of a new admin")}`;
    }
    case "second_factor.on":
      return `${who} turned on the second sign-in factor for ${self ? "their own account" : account}`;
    case "second_factor.off":
      return `${who} turned off the second sign-in factor for ${self ? "their own account" : account}`;
    case "second_factor.recovery_code_used": {
      const left = numberOf(field(entry.after, "left"));
      return `${who} signed in with a recovery code${left === null ? "" : ` (${left} left)`}`;
    }
    case "yard.update":
      return `${who} changed the yard details of ${account}`;
    case "settings.update":
      return `${who} changed the marketplace settings`;
    case "payout.approve": {
      const amount = numberOf(field(entry.after, "amountMinor"));
      const currency = field(entry.after, "currency");
      const money = amount !== null && typeof currency === "string" ? ` of ${formatMoney(amount, currency)}` : "";
      return `${who} approved a payout${money} to ${account}`;
    }
    case "order.dispute_refund": {
      const before = numberOf(field(entry.before, "refundedMinor")) ?? 0;
      const after = numberOf(field(entry.after, "refundedMinor"));
      const money = after !== null && entry.subject.currency ? `${formatMoney(after - before, entry.subject.currency)} of ` : "";
      return `${who} refunded ${money}${name ? `the order for ${quoted(name, "")}` : "an order"}${owner ? ` to ${owner}` : ""} for a dispute`;
    }
    case "email.resend":
      return `${who} sent ${name ? `the e-mail ${quoted(name, "")}` : "an e-mail"}${owner ? ` to ${owner}` : ""} again`;
    default:
      return `${who}: ${auditActionLabels[entry.action] ?? entry.action} (${entry.targetKind} ${name ?? entry.targetId})`;
  }
}

/** Field names as the desk reads them. */
const fieldLabels: Record<string, string> = {
  status: "State",
  suspended: "Suspended",
  reason: "Reason",
  role: "Role",
  email: "E-mail",
  hidden: "Hidden",
  rating: "Rating",
  left: "Recovery codes left",
  attempts: "Attempts",
  lastError: "Last error",
  refundedMinor: "Refunded in all",
  amountMinor: "Amount",
  currency: "Currency",
  orders: "Orders",
  attempt: "Attempt",
  sessionsRevoked: "Sessions ended",
  listingsHidden: "Listings hidden",
  ordersExpired: "Held orders released",
  listingsReturned: "Listings back on sale",
  closedTogether: "Other reports closed",
  platformFeeBps: "Platform fee",
  processingFeeBps: "Card processing rate",
  processingFixedMinor: "Card processing, per order",
  holdDays: "Hold after hand-over",
  reservationMinutes: "Reservation time",
  taxRateBps: "Tax rate",
  yardName: "Yard name",
  pickupTown: "Pickup town",
  yardStory: "Yard story",
  displayName: "Name",
};
/** Bookkeeping the sentence or the page already carries. */
const hiddenFields = new Set(["orderId", "sawyerId", "payoutId", "refundId", "shares"]);

export interface AuditChange {
  field: string;
  label: string;
  before: string;
  after: string;
}

function readable(key: string, value: unknown, currency: string | null): string {
  if (value === null || value === undefined || value === "") return "—";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "number") {
    if (key.endsWith("Bps")) return `${value / 100} %`;
    if (key.endsWith("Minor")) return currency ? formatMoney(value, currency) : `${value} ¢`;
    if (key === "holdDays") return `${value} ${value === 1 ? "day" : "days"}`;
    if (key === "reservationMinutes") return `${value} minutes`;
    return String(value);
  }
  if (typeof value === "string") return key === "status" ? value.replaceAll("_", " ") : value;
  if (Array.isArray(value)) return value.length === 0 ? "none" : String(value.length);
  return JSON.stringify(value);
}

/** The before and after states as table rows: one per field either side has, in a readable form. */
export function auditChanges(entry: AuditEntry): AuditChange[] {
  const asObject = (state: unknown): Record<string, unknown> =>
    state && typeof state === "object" && !Array.isArray(state) ? (state as Record<string, unknown>) : {};
  const before = asObject(entry.before);
  const after = asObject(entry.after);
  const currency = (typeof after.currency === "string" ? after.currency : null) ?? entry.subject.currency;
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])].filter((key) => !hiddenFields.has(key));
  return keys.map((key) => ({
    field: key,
    label: fieldLabels[key] ?? key,
    before: key in before ? readable(key, before[key], currency) : "—",
    after: key in after ? readable(key, after[key], currency) : "—",
  }));
}
