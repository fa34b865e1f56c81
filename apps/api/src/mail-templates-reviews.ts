import type { OutgoingMail } from "./integrations/mail.ts";
import { layout } from "./mail-templates.ts";

/** E-mails about reviews of completed orders: a new review for the sawyer, an answer or a hiding for the buyer. */

const yesNo = (yes: boolean, comment: string) => (yes ? "yes" : "no") + (comment ? ` — “${comment}”` : "");

export function reviewWrittenMail(
  to: { email: string; displayName: string },
  review: {
    rating: number;
    matchedListing: boolean;
    matchedListingComment: string;
    handoverWentWell: boolean;
    handoverComment: string;
    body: string;
  },
  buyerName: string,
  title: string,
  link: string,
): OutgoingMail {
  return {
    to: to.email,
    subject: `${buyerName} reviewed "${title}": ${review.rating} of 5`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `${buyerName} wrote a review of "${title}": ${review.rating} of 5.`,
        `The slab matched its listing: ${yesNo(review.matchedListing, review.matchedListingComment)}`,
        `The hand-over went well: ${yesNo(review.handoverWentWell, review.handoverComment)}`,
        ...(review.body ? [`“${review.body}”`] : []),
        "You may answer it once, on the order page. Buyers read the answer beside the review.",
      ],
      { label: "Answer the review", url: link },
    ),
  };
}

export function reviewAnsweredMail(
  to: { email: string; displayName: string },
  yardName: string,
  title: string,
  answer: string,
  link: string,
): OutgoingMail {
  return {
    to: to.email,
    subject: `${yardName} answered your review of "${title}"`,
    ...layout([`Hello ${to.displayName},`, `${yardName} answered your review of "${title}":`, `“${answer}”`], {
      label: "Read it on the order page",
      url: link,
    }),
  };
}

export function reviewHiddenMail(to: { email: string; displayName: string }, title: string, reason: string, link: string): OutgoingMail {
  return {
    to: to.email,
    subject: `Your review of "${title}" was hidden`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `A Grainyard admin hid your review of "${title}". It no longer shows on the yard's page or counts in its rating:`,
        `“${reason}”`,
        "Reply to this e-mail if you think this is a mistake.",
      ],
      { label: "See the order", url: link },
    ),
  };
}
