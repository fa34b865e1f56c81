import { endpoint } from "../endpoint.ts";
import {
  adminReviewListSchema,
  adminReviewQuerySchema,
  orderReviewEnvelopeSchema,
  orderReviewStateSchema,
  reviewAnswerInputSchema,
  reviewInputSchema,
  reviewModerationSchema,
  yardReviewQuerySchema,
  yardReviewsSchema,
} from "../order-reviews.ts";
import { API_PREFIX } from "./prefix.ts";

const adminOnly = ["admin"] as const;

/**
 * Reviews of completed orders: the buyer writes one and may change it for 14 days, the sawyer
 * answers once, an admin hides one for a stated reason (or shows it again); anyone reads a
 * yard's visible reviews and rating.
 */
export const orderReviewEndpoints = {
  getOrderReview: endpoint({
    method: "GET",
    path: `${API_PREFIX}/orders/:orderId/review`,
    summary: "An order's review (or none yet) and what the one looking may do with it, for its buyer, its sawyer or an admin.",
    access: "signed_in",
    answer: orderReviewStateSchema,
  }),
  writeReview: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/review`,
    summary: "The buyer reviews a completed order (once).",
    access: ["buyer"],
    body: reviewInputSchema,
    answer: orderReviewStateSchema,
    status: 201,
    errors: ["order_state", "review_exists"],
  }),
  editReview: endpoint({
    method: "PATCH",
    path: `${API_PREFIX}/orders/:orderId/review`,
    summary: "The buyer changes their review, within 14 days of writing it.",
    access: ["buyer"],
    body: reviewInputSchema,
    answer: orderReviewStateSchema,
    errors: ["review_edit_closed"],
  }),
  answerReview: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/review/answer`,
    summary: "The sawyer answers the review of their sale (once).",
    access: ["sawyer"],
    body: reviewAnswerInputSchema,
    answer: orderReviewStateSchema,
    status: 201,
    errors: ["review_answered", "review_hidden"],
  }),
  yardReviews: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yards/:sawyerId/reviews`,
    summary: "A yard's visible reviews, newest first, with its rating.",
    access: "anyone",
    query: yardReviewQuerySchema,
    answer: yardReviewsSchema,
  }),
  listReviews: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/order-reviews`,
    summary: "The latest reviews for the desk, hidden ones or visible ones.",
    access: adminOnly,
    query: adminReviewQuerySchema,
    answer: adminReviewListSchema,
  }),
  hideReview: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/order-reviews/:reviewId/hide`,
    summary: "Hide a review for a stated reason (audited); it stops counting in the yard's rating.",
    access: adminOnly,
    body: reviewModerationSchema,
    answer: orderReviewEnvelopeSchema,
    errors: ["review_hidden"],
  }),
  showReview: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/order-reviews/:reviewId/show`,
    summary: "Show a hidden review again, with a reason (audited).",
    access: adminOnly,
    body: reviewModerationSchema,
    answer: orderReviewEnvelopeSchema,
    errors: ["review_not_hidden"],
  }),
} as const;
