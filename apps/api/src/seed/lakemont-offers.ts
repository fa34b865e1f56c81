import { In, type DataSource } from "typeorm";
import { AccountEntity, ListingEntity } from "../entities/index.ts";
import type { Actor } from "../services/actor.ts";
import type { OfferService } from "../services/offer-service.ts";

/*
 * Offers in the Lakemont demo: a few yards welcome offers on some of their live slabs (with a floor
 * at about three quarters of the price), and the demo buyers have offers waiting — one still with
 * the sawyer, one answered with a counter — made through the offer service like any other (no
 * e-mail: the seed's mail queue keeps nothing). Added only with the stock it belongs to.
 */

/** Yards that take offers, and on how many of their cheapest live slabs. */
const OFFER_YARDS = [
  { email: "yard@ridgeback-timber.test", listings: 4 },
  { email: "hello@cobblelane-slabs.test", listings: 3 },
];

const actorOf = (account: AccountEntity): Actor => ({
  kind: "account",
  accountId: account.id,
  role: account.role,
  emailVerified: true,
  sessionKeyHash: "lakemont-seed",
});

/** Rounded down to whole units of the currency (offers people type are round numbers). */
const round = (minor: number) => Math.floor(minor / 100) * 100;

export async function seedLakemontOffers(dataSource: DataSource, offers: OfferService, listingIds: string[]): Promise<number> {
  if (listingIds.length === 0) return 0;
  const accounts = new Map((await dataSource.getRepository(AccountEntity).find()).map((a) => [a.email, a]));
  const buyers = ["ana.theo@lakemont-home.test", "shop@fernhill-furniture.test"].map((email) => accounts.get(email));
  let made = 0;
  for (const yard of OFFER_YARDS) {
    const sawyer = accounts.get(yard.email);
    if (!sawyer) continue;
    const listings = await dataSource.getRepository(ListingEntity).find({
      where: { id: In(listingIds), sawyerId: sawyer.id, status: "live" },
      order: { priceMinor: "ASC" },
      take: yard.listings,
    });
    for (const listing of listings)
      await offers.setSettings(actorOf(sawyer), listing.id, { offersWelcome: true, floorMinor: round(listing.priceMinor * 0.75) });
    // The first slab has an offer waiting on the sawyer; the second, an offer the sawyer countered.
    for (const [index, listing] of listings.slice(0, 2).entries()) {
      const buyer = buyers[index];
      if (!buyer) continue;
      const offer = await offers.make(actorOf(buyer), listing.id, {
        amountMinor: round(listing.priceMinor * 0.85),
        message: index === 0 ? "For our first dining table — could you do a little less?" : "Would you take this for a bench top?",
        handover: listing.pickup ? "pickup" : "freight",
        deliveryAddress: listing.pickup ? null : "22 Orchard Row, Lakemont",
      });
      made += 1;
      if (index === 1)
        await offers.counter(actorOf(sawyer), offer.id, {
          amountMinor: round(listing.priceMinor * 0.93),
          message: "It is kiln-dried and flattened already; I can meet you here.",
        });
    }
  }
  return made;
}
