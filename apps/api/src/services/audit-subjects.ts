import type { AuditSubject } from "@grainyard/contracts";
import { In, type DataSource } from "typeorm";
import {
  AccountEntity,
  type AuditEntryEntity,
  ContentReportEntity,
  ListingEntity,
  OrderEntity,
  OrderReviewEntity,
  OutboxEmailEntity,
} from "../entities/index.ts";

/** How the log names a person: a sawyer by their yard, anyone else by their name. */
const personName = (account: AccountEntity | undefined): string | null => (account ? (account.yardName ?? account.displayName) : null);

/**
 * Names for a page of audit entries, read in a few batched queries: each acting admin's display
 * name, and what each entry was about by its title or name now (a listing's title and yard, an
 * account's name, an order's title, the e-mail's subject and recipient …). The entries keep ids only;
 * a thing removed since reads as unnamed.
 */
export async function auditNames(
  dataSource: DataSource,
  entries: AuditEntryEntity[],
): Promise<{ actors: Map<string, string>; subjects: Map<string, AuditSubject> }> {
  const idsOf = (kind: string) => [...new Set(entries.filter((e) => e.targetKind === kind).map((e) => e.targetId))];
  const find = <T extends object>(entity: new () => T, ids: string[]): Promise<T[]> =>
    ids.length ? dataSource.getRepository(entity).findBy({ id: In(ids) } as never) : Promise.resolve([]);

  const [listings, reports, reviews, orders, emails] = await Promise.all([
    find(ListingEntity, idsOf("listing")),
    find(ContentReportEntity, idsOf("report")),
    find(OrderReviewEntity, idsOf("review")),
    find(OrderEntity, idsOf("order")),
    find(OutboxEmailEntity, idsOf("email")),
  ]);
  const reportListings = await find(
    ListingEntity,
    reports.flatMap((r) => (r.listingId && r.targetKind === "listing" ? [r.listingId] : [])),
  );
  const reviewOrders = await find(
    OrderEntity,
    reviews.map((r) => r.orderId),
  );
  const people = await find(AccountEntity, [
    ...new Set([
      ...entries.flatMap((e) => (e.actorId ? [e.actorId] : [])),
      ...idsOf("account"),
      ...listings.map((l) => l.sawyerId),
      ...reports.map((r) => r.reportedAccountId),
      ...reviews.map((r) => r.buyerId),
      ...orders.map((o) => o.buyerId),
    ]),
  ]);
  const person = new Map(people.map((p) => [p.id, p]));
  const listing = new Map([...listings, ...reportListings].map((l) => [l.id, l]));
  const report = new Map(reports.map((r) => [r.id, r]));
  const review = new Map(reviews.map((r) => [r.id, r]));
  const order = new Map([...orders, ...reviewOrders].map((o) => [o.id, o]));
  const email = new Map(emails.map((m) => [m.id, m]));

  const none: AuditSubject = { name: null, owner: null, currency: null };
  function subjectOf(entry: AuditEntryEntity): AuditSubject {
    switch (entry.targetKind) {
      case "listing": {
        const found = listing.get(entry.targetId);
        return found ? { ...none, name: found.title, owner: personName(person.get(found.sawyerId)) } : none;
      }
      case "account":
        return { ...none, name: personName(person.get(entry.targetId)) };
      case "report": {
        const found = report.get(entry.targetId);
        if (!found) return none;
        const about = found.targetKind === "listing" && found.listingId ? listing.get(found.listingId) : undefined;
        return { ...none, name: about?.title ?? null, owner: personName(person.get(found.reportedAccountId)) };
      }
      case "review": {
        const found = review.get(entry.targetId);
        if (!found) return none;
        return { ...none, name: order.get(found.orderId)?.title ?? null, owner: person.get(found.buyerId)?.displayName ?? null };
      }
      case "order": {
        const found = order.get(entry.targetId);
        return found ? { name: found.title, owner: person.get(found.buyerId)?.displayName ?? null, currency: found.currency } : none;
      }
      case "email": {
        const found = email.get(entry.targetId);
        return found ? { ...none, name: found.subject, owner: found.recipient } : none;
      }
      default:
        return none;
    }
  }
  const actors = new Map<string, string>();
  for (const entry of entries) {
    const actor = entry.actorId ? person.get(entry.actorId) : undefined;
    if (actor) actors.set(entry.id, actor.displayName);
  }
  return { actors, subjects: new Map(entries.map((entry) => [entry.id, subjectOf(entry)])) };
}
