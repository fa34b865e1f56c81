import type { orderReviewEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { OrderReviewService } from "../services/order-review-service.ts";

/** Reviews of completed orders: the buyer's review, the sawyer's answer, a yard's reviews, the desk's hiding. */
export function orderReviewHandlers(reviews: OrderReviewService): Handlers<typeof orderReviewEndpoints> {
  return {
    getOrderReview: ({ actor, params }) => reviews.state(actor, params.orderId),
    writeReview: ({ actor, params, body }) => reviews.write(actor, params.orderId, body),
    editReview: ({ actor, params, body }) => reviews.edit(actor, params.orderId, body),
    answerReview: ({ actor, params, body }) => reviews.answer(actor, params.orderId, body),
    yardReviews: ({ params, query }) => reviews.yardReviews(params.sawyerId, query),
    listReviews: async ({ actor, query }) => ({ reviews: await reviews.listForDesk(actor, query.hidden) }),
    hideReview: async ({ actor, params, body }) => ({ review: await reviews.hide(actor, params.reviewId, body.reason) }),
    showReview: async ({ actor, params, body }) => ({ review: await reviews.show(actor, params.reviewId, body.reason) }),
  };
}
