import type { EndpointSpec } from "../endpoint.ts";
import { accountEndpoints } from "./accounts.ts";
import { adminEndpoints, reportEndpoints } from "./admin.ts";
import { buyerEndpoints, messageEndpoints } from "./buyer-tools.ts";
import { catalogueEndpoints } from "./catalogue.ts";
import { listingEndpoints, reviewEndpoints } from "./listings.ts";
import { orderEndpoints } from "./orders.ts";
import { orderReviewEndpoints } from "./order-reviews.ts";
import { offerEndpoints } from "./offers.ts";
import { payoutEndpoints } from "./payouts.ts";
import { secondFactorEndpoints } from "./second-factor.ts";
import { healthEndpoints, testClockEndpoints } from "./system.ts";
import { yardEndpoints } from "./yard.ts";
import { yardPageEndpoints } from "./yard-pages.ts";

export { API_PREFIX } from "./prefix.ts";
export { accountEndpoints } from "./accounts.ts";
export { adminEndpoints, reportEndpoints } from "./admin.ts";
export { buyerEndpoints, messageEndpoints } from "./buyer-tools.ts";
export { catalogueEndpoints, placeQuerySchema } from "./catalogue.ts";
export { listingEndpoints, reviewEndpoints } from "./listings.ts";
export { orderEndpoints } from "./orders.ts";
export { orderReviewEndpoints } from "./order-reviews.ts";
export { offerEndpoints } from "./offers.ts";
export { payoutEndpoints } from "./payouts.ts";
export { secondFactorEndpoints } from "./second-factor.ts";
export { healthEndpoints, testClockEndpoints, testClockSchema } from "./system.ts";
export { yardEndpoints } from "./yard.ts";
export { yardPageEndpoints } from "./yard-pages.ts";

/**
 * The whole endpoint table, by domain. The API mounts every route from it and the role matrix
 * needs a sample per row; the web imports only the domain tables it uses (to keep bundles small).
 */
export const endpointTable = {
  health: healthEndpoints,
  accounts: accountEndpoints,
  secondFactor: secondFactorEndpoints,
  yard: yardEndpoints,
  listings: listingEndpoints,
  review: reviewEndpoints,
  catalogue: catalogueEndpoints,
  orders: orderEndpoints,
  orderReviews: orderReviewEndpoints,
  offers: offerEndpoints,
  yardPages: yardPageEndpoints,
  buyer: buyerEndpoints,
  messages: messageEndpoints,
  reports: reportEndpoints,
  admin: adminEndpoints,
  payouts: payoutEndpoints,
  testClock: testClockEndpoints,
} as const;

type Table = typeof endpointTable;
/** "domain.name" for every endpoint, e.g. "yard.createLog". */
export type EndpointKey = { [D in keyof Table]: `${D & string}.${keyof Table[D] & string}` }[keyof Table];

/** Every endpoint with its key, in table order. */
export function everyEndpoint(): { key: EndpointKey; spec: EndpointSpec }[] {
  return Object.entries(endpointTable).flatMap(([domain, table]) =>
    Object.entries(table as Record<string, EndpointSpec>).map(([name, spec]) => ({ key: `${domain}.${name}` as EndpointKey, spec })),
  );
}
