import { z } from "zod";

/**
 * Every error code the API answers with, its one HTTP status, and — where the answer carries more
 * than a message — the schema of that detail. The API's error constructors take only these codes
 * (typed by status), the endpoint table names the codes each endpoint may answer, and the web
 * narrows on them.
 */
const entry = <const S extends number>(status: S, about: string) => ({ status, about });

export const csvRowErrorSchema = z.object({ row: z.number(), field: z.string(), message: z.string() });
export type CsvRowError = z.infer<typeof csvRowErrorSchema>;

export const errorCatalogue = {
  // Any endpoint.
  malformed_request: entry(400, "The body or query could not be read (not JSON, wrong encoding)."),
  not_signed_in: entry(401, "The endpoint needs a signed-in account."),
  forbidden: entry(403, "The account may not do this (wrong role, or not its own)."),
  csrf_rejected: entry(403, "The anti-forgery token is missing or stale, or the request came from another site."),
  not_found: entry(404, "No such thing, or not visible to this account."),
  invalid_input: entry(422, "Some fields need another look; `fields` maps each field to its message."),
  too_large: entry(413, "The request body is larger than the endpoint takes."),
  too_many_requests: entry(429, "Too many attempts in a short time."),
  internal: entry(500, "Something went wrong on the server (details go to its log only)."),
  unavailable: entry(503, "A part the API needs is down for a moment."),

  // Accounts and sign-in.
  wrong_credentials: entry(401, "The e-mail and password do not match an account."),
  account_suspended: entry(403, "The account is suspended."),
  already_signed_in: entry(409, "Signed in already: sign out before making another account."),
  already_verified: entry(409, "The e-mail address is confirmed already."),
  link_invalid: entry(422, "The link's token is not one we issued."),
  link_used: entry(410, "The link was used already."),
  link_expired: entry(410, "The link is too old."),
  email_unverified: entry(403, "Confirm the e-mail address first."),
  wrong_password: entry(422, "The password given to confirm a change is not the account's."),

  // The second factor (codes from an authenticator app, recovery codes).
  second_factor_setup_required: entry(403, "An admin must switch on a second factor before doing anything else."),
  second_factor_wrong: entry(422, "The code from the authenticator app (or the recovery code) is not right."),
  second_factor_used: entry(409, "That code was used already: wait for the next one."),
  second_step_expired: entry(401, "The sign-in waited too long for its code (or was never started): enter the password again."),
  second_factor_on: entry(409, "The account has its second factor on already."),
  second_factor_off: entry(409, "The account has no second factor to remove."),
  second_factor_not_started: entry(409, "No set-up was started (or it was replaced): start it again."),

  // The yard.
  invalid_measurement: entry(422, "The measurements cannot describe a slab."),
  log_has_slabs: entry(409, "The log still has slabs."),
  log_has_no_slabs: entry(409, "The log has no slabs to take readings on."),
  slab_listed: entry(409, "The slab is in a listing."),
  slab_locked: entry(409, "The slab is sold or reserved and cannot change."),
  csv_empty: entry(422, "The CSV file has no rows."),
  csv_unreadable: entry(422, "The file is not CSV we can read."),
  csv_too_long: entry(422, "The CSV file has more rows than one import takes."),
  csv_columns_missing: entry(422, "The CSV file lacks required columns."),
  csv_rows_invalid: entry(422, "Rows of the CSV file are wrong; nothing was saved."),

  // Listings and photos.
  listing_not_editable: entry(409, "The listing cannot change in its present state."),
  listing_not_submittable: entry(409, "The listing cannot go to review in its present state."),
  listing_not_withdrawable: entry(409, "The listing cannot be withdrawn in its present state."),
  listing_not_in_review: entry(409, "The listing is not waiting for review."),
  slab_already_listed: entry(409, "A slab is in another listing."),
  photos_missing: entry(422, "The listing needs photos before review."),
  sawyer_suspended: entry(409, "The sawyer's account is suspended."),
  too_many_photos: entry(409, "The listing or log has as many photos as it may."),
  too_large_file: entry(413, "The photo file is larger than we take."),
  not_an_image: entry(422, "The file is not a photo."),
  unsupported_format: entry(422, "The photo's format is not one we take."),
  too_many_pixels: entry(422, "The photo has more pixels than we take."),
  corrupt_image: entry(422, "The photo file is damaged."),
  decompression_bomb: entry(422, "The photo would expand to far more than its file size."),
  storage_unavailable: entry(503, "Photo storage is down for a moment."),

  // The catalogue.
  bad_cursor: entry(422, "The page cursor is stale or altered."),
  unknown_place: entry(422, "No town of that name."),

  // Buying and orders.
  listing_not_available: entry(409, "The slab is reserved, sold or not live."),
  payments_unavailable: entry(503, "The payment provider is down for a moment."),
  order_state: entry(409, "The order is not at a step where this can happen."),
  bad_signature: entry(400, "The payment provider's webhook signature did not verify."),

  // Buyer tools, messages and reports.
  too_many_saved_searches: entry(409, "The buyer has as many saved searches as they may."),
  own_listing: entry(403, "A sawyer cannot ask about their own listing."),
  already_reported: entry(409, "This person reported the same thing already."),
  report_resolved: entry(409, "The report is resolved already."),
  listing_not_removable: entry(409, "The listing cannot be taken down in its present state."),

  // Moderation.
  admin_not_suspendable: entry(403, "Admin accounts cannot be suspended from the desk."),
  already_suspended: entry(409, "The account is suspended already."),
  not_suspended: entry(409, "The account is not suspended."),
  email_already_sent: entry(409, "The e-mail went out already (or is going out now), so there is nothing to resend."),

  // Payouts and refunds.
  payout_account_missing: entry(409, "The sawyer has no payout account."),
  payout_account_unfinished: entry(409, "The sawyer's payout account is not ready for transfers."),
  payout_changed: entry(409, "What is due changed since the desk was loaded."),
  order_not_refundable: entry(409, "The order cannot be refunded (nothing left, or not paid)."),
  refund_refused: entry(409, "The payment provider refused the refund."),
  problem_resolved: entry(409, "The reported problem is settled already (or being settled now)."),

  // Reviews of completed orders.
  review_exists: entry(409, "The order has its review already (one per order)."),
  review_edit_closed: entry(409, "The review can no longer be changed (its days for changes are over, or it is hidden)."),
  review_answered: entry(409, "The sawyer has answered this review already (once per review)."),
  review_hidden: entry(409, "The review is hidden by an admin."),
  review_not_hidden: entry(409, "The review is not hidden."),

  // Offers on listings.
  offers_closed: entry(409, "The sawyer does not take offers on this listing (or it is not for sale)."),
  offer_exists: entry(409, "The buyer has an offer on this listing still waiting for an answer."),
  offer_state: entry(409, "The offer is not at a step where this can happen (answered, expired, or no rounds left)."),
} as const;

export type ErrorCode = keyof typeof errorCatalogue;
export type ErrorStatus<C extends ErrorCode> = (typeof errorCatalogue)[C]["status"];
/** The codes that answer with `status`: the API's error classes take only these. */
export type ErrorCodeWithStatus<S extends number> = { [C in ErrorCode]: ErrorStatus<C> extends S ? C : never }[ErrorCode];

/** Codes any endpoint may answer; the table lists only the others, per endpoint. */
export const everyEndpointErrors = [
  "malformed_request",
  "not_signed_in",
  "forbidden",
  "csrf_rejected",
  "not_found",
  "invalid_input",
  "too_large",
  "too_many_requests",
  "internal",
  "unavailable",
  "second_factor_setup_required",
] as const satisfies readonly ErrorCode[];

/** Detail some codes carry beside the message. */
export const errorDetails = {
  csv_rows_invalid: z.object({ rows: z.array(csvRowErrorSchema) }),
} as const satisfies Partial<Record<ErrorCode, z.ZodType>>;

export function isErrorCode(code: string): code is ErrorCode {
  return Object.hasOwn(errorCatalogue, code);
}

/** Every error the API returns has this shape; `fields` maps a field path to its message. */
export const apiErrorSchema = z.object({
  error: z.looseObject({
    code: z.string(),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
