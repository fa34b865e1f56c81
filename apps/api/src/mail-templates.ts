import escape from "escape-html";
import { countOf, formatPickupWindow, REVIEW_EDIT_DAYS, type OrderSlabSnapshot } from "@grainyard/contracts";
import { formatMoney } from "@grainyard/slab-math";
import type { OutgoingMail } from "./integrations/mail.ts";

/** The words of every e-mail Grainyard sends, in one place. Plain text first; the HTML mirrors it. */
export function layout(paragraphs: string[], action?: { label: string; url: string }): { text: string; html: string } {
  const text = [...paragraphs, ...(action ? [`${action.label}: ${action.url}`] : []), "", "— Grainyard, slabs from city trees"].join(
    "\n\n",
  );
  const html = `<div style="font-family:Georgia,serif;color:#2b241c;max-width:560px">${paragraphs.map((p) => `<p>${escape(p)}</p>`).join("")}${
    action
      ? `<p><a href="${escape(action.url)}" style="background:#6b3f1d;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escape(action.label)}</a></p><p style="font-size:13px;color:#6d6256">Or paste this address into your browser: ${escape(action.url)}</p>`
      : ""
  }<p style="font-size:13px;color:#6d6256">— Grainyard, slabs from city trees</p></div>`;
  return { text, html };
}

export function verificationMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "Confirm your e-mail for Grainyard",
    ...layout(
      [
        `Hello ${displayName},`,
        "Please confirm this address so we know it reaches you. The link works once and expires in 48 hours.",
        "If you did not sign up, you can ignore this e-mail.",
      ],
      { label: "Confirm my e-mail", url: link },
    ),
  };
}

export function passwordResetMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "Reset your Grainyard password",
    ...layout(
      [
        `Hello ${displayName},`,
        "Someone asked to reset the password of this Grainyard account. The link works once and expires in 1 hour.",
        "If it was not you, ignore this e-mail: your password stays as it is.",
      ],
      { label: "Choose a new password", url: link },
    ),
  };
}

/** To the owner of an address someone tried to join with (the join answers the same either way). */
export function joinAttemptMail(to: string, displayName: string, signInLink: string, resetLink: string): OutgoingMail {
  return {
    to,
    subject: "Someone tried to join Grainyard with your e-mail",
    ...layout(
      [
        `Hello ${displayName},`,
        "Someone just tried to make a new Grainyard account with this e-mail address. It already belongs to your account, so no new account was made and nothing about yours changed.",
        `If it was you, sign in instead: ${signInLink}`,
        "Forgot your password? Choose a new one with the button below. If it was not you, you need do nothing.",
      ],
      { label: "Choose a new password", url: resetLink },
    ),
  };
}

/** To the owner of an account that many wrong passwords were tried on. */
export function signInAttemptsMail(to: string, displayName: string, failures: number, resetLink: string): OutgoingMail {
  return {
    to,
    subject: "Wrong passwords were tried on your Grainyard account",
    ...layout(
      [
        `Hello ${displayName},`,
        `In the last 15 minutes, ${failures} sign-ins to your Grainyard account failed with a wrong password.`,
        "Your account is not locked: you can sign in as usual. Each wrong try is now slowed down, and an address that keeps guessing is turned away.",
        "If these were not you, your password held. To be safe you may choose a new, longer one that you use nowhere else.",
      ],
      { label: "Choose a new password", url: resetLink },
    ),
  };
}

export function listingApprovedMail(to: string, displayName: string, title: string, link: string): OutgoingMail {
  return {
    to,
    subject: `Your listing is live: ${title}`,
    ...layout(
      [`Hello ${displayName},`, `Good news: "${title}" passed review and is now live on Grainyard. Buyers can find it from today.`],
      { label: "See the listing", url: link },
    ),
  };
}

export function listingSentBackMail(to: string, displayName: string, title: string, reason: string, link: string): OutgoingMail {
  return {
    to,
    subject: `Changes needed before "${title}" goes live`,
    ...layout(
      [
        `Hello ${displayName},`,
        `Our reviewer looked at "${title}" and asks for a change before it goes live:`,
        `“${reason}”`,
        "Edit the listing and submit it again; it comes straight back to the review list.",
      ],
      { label: "Edit the listing", url: link },
    ),
  };
}

interface OrderForMail {
  id: string;
  title: string;
  currency: string;
  priceMinor: number;
  taxMinor: number;
  totalMinor: number;
  sawyerNetMinor: number;
  platformFeeMinor: number;
  processingFeeMinor: number;
  handover: "pickup" | "freight";
  deliveryAddress: string | null;
  slabSnapshot: OrderSlabSnapshot[];
}

function slabLines(order: OrderForMail): string[] {
  return order.slabSnapshot.map(
    ({ lengthMm, thicknessMm, figures }, index) =>
      `Slab ${index + 1}: ${lengthMm} × ${Math.round(figures.averageWidthMm)} × ${thicknessMm} mm, ${figures.boardFeet.toFixed(1)} board feet, up to ${Math.round(figures.weightHighKg)} kg`,
  );
}

export function orderPaidBuyerMail(
  buyer: { email: string; displayName: string },
  sawyer: { yardName: string | null; pickupTown: string | null },
  order: OrderForMail,
  link: string,
): OutgoingMail {
  const handover =
    order.handover === "pickup"
      ? `Pickup at ${sawyer.yardName ?? "the yard"}, ${sawyer.pickupTown ?? ""}. The sawyer will propose pickup times.`
      : `Freight to: ${order.deliveryAddress ?? ""}. The sawyer will send the carrier and tracking reference.`;
  return {
    to: buyer.email,
    subject: `Your order: ${order.title}`,
    ...layout(
      [
        `Hello ${buyer.displayName},`,
        `Thank you: your payment for "${order.title}" from ${sawyer.yardName ?? "the yard"} is confirmed.`,
        `Receipt for order ${order.id.slice(0, 8).toUpperCase()}:`,
        ...slabLines(order),
        `Price ${formatMoney(order.priceMinor, order.currency)} · tax ${formatMoney(order.taxMinor, order.currency)} · total paid ${formatMoney(order.totalMinor, order.currency)}.`,
        handover,
        "Slabs are heavy: lift with two people or a machine, secure the load, and keep to local load and vehicle limits.",
      ],
      { label: "See your order and receipt", url: `${link}/receipt` },
    ),
  };
}

export function orderPaidSawyerMail(
  sawyer: { email: string; displayName: string },
  buyer: { displayName: string },
  order: OrderForMail,
  link: string,
): OutgoingMail {
  return {
    to: sawyer.email,
    subject: `Sold: ${order.title}`,
    ...layout(
      [
        `Hello ${sawyer.displayName},`,
        `${buyer.displayName} bought "${order.title}" and the payment is confirmed.`,
        `Price ${formatMoney(order.priceMinor, order.currency)} − platform fee ${formatMoney(order.platformFeeMinor, order.currency)} − card processing ${formatMoney(order.processingFeeMinor, order.currency)} = your net ${formatMoney(order.sawyerNetMinor, order.currency)}.`,
        order.handover === "pickup"
          ? "The buyer collects from your yard: propose pickup times from the order page."
          : `Freight to: ${order.deliveryAddress ?? ""}. Add the carrier and tracking reference on the order page.`,
      ],
      { label: "Open the order", url: link },
    ),
  };
}

// ---- The steps of an order after payment ----

export type OrderStep = "pickup_windows_proposed" | "pickup_window_chosen" | "shipped" | "handed_over" | "completed" | "cancelled";

interface OrderStepFacts extends OrderForMail {
  pickupWindows: { startsAt: string; endsAt: string }[] | null;
  pickupAddress: string | null;
  pickupStartsAt: Date | null;
  pickupEndsAt: Date | null;
  carrier: string | null;
  trackingReference: string | null;
  handedOverAt: Date | null;
  completedBy: "buyer" | "automatic" | "desk" | null;
  cancelledBy: "buyer" | "sawyer" | null;
  cancelReason: string | null;
  status: string;
}

const LIFT_CAUTION = "Slabs are heavy: lift with two people or a machine, secure the load, and keep to local load and vehicle limits.";

/** One e-mail per step of an order, to the buyer or the sawyer, in the same plain words as the order page. */
export function orderStepMail(
  to: { email: string; displayName: string },
  role: "buyer" | "sawyer",
  step: OrderStep,
  order: OrderStepFacts,
  parties: { buyerName: string; yardName: string | null; pickupTown: string | null; yardTimeZone: string },
  link: string,
  autoCompleteDays: number,
): OutgoingMail {
  const yard = parties.yardName ?? "the yard";
  const title = `"${order.title}"`;
  const hello = `Hello ${to.displayName},`;
  const chosen =
    order.pickupStartsAt && order.pickupEndsAt
      ? formatPickupWindow({ startsAt: order.pickupStartsAt, endsAt: order.pickupEndsAt }, parties.yardTimeZone)
      : "";
  let subject: string;
  let lines: string[];
  switch (step) {
    case "pickup_windows_proposed": {
      const windows = (order.pickupWindows ?? []).map((w, i) => `${i + 1}. ${formatPickupWindow(w, parties.yardTimeZone)}`);
      subject = role === "buyer" ? `Choose a pickup time: ${order.title}` : `Pickup times sent: ${order.title}`;
      lines =
        role === "buyer"
          ? [
              hello,
              `${yard} is ready for you to collect ${title}. Choose one of these times on the order page:`,
              ...windows,
              `Where: ${order.pickupAddress ?? ""}`,
              LIFT_CAUTION,
            ]
          : [
              hello,
              `You proposed these pickup times to ${parties.buyerName} for ${title}:`,
              ...windows,
              `Where: ${order.pickupAddress ?? ""}`,
              "We will tell you when the buyer chooses one.",
            ];
      break;
    }
    case "pickup_window_chosen":
      subject = role === "buyer" ? `Pickup booked: ${order.title}` : `The buyer chose a pickup time: ${order.title}`;
      lines =
        role === "buyer"
          ? [
              hello,
              `You will collect ${title} from ${yard}: ${chosen}.`,
              `Where: ${order.pickupAddress ?? ""}`,
              "Bring enough hands or a lifting aid, straps and a vehicle long enough for the slab.",
              LIFT_CAUTION,
            ]
          : [
              hello,
              `${parties.buyerName} will collect ${title}: ${chosen}.`,
              `Where: ${order.pickupAddress ?? ""}`,
              "Mark the order as handed over once it has left the yard.",
            ];
      break;
    case "shipped":
      subject = role === "buyer" ? `On its way: ${order.title}` : `Marked as shipped: ${order.title}`;
      lines =
        role === "buyer"
          ? [
              hello,
              `${yard} sent ${title} by freight to: ${order.deliveryAddress ?? ""}.`,
              `Carrier: ${order.carrier ?? ""}. Tracking reference: ${order.trackingReference ?? ""}.`,
              "Have help ready for the delivery. " + LIFT_CAUTION,
            ]
          : [
              hello,
              `You sent ${title} to ${parties.buyerName}.`,
              `Carrier: ${order.carrier ?? ""}. Tracking reference: ${order.trackingReference ?? ""}.`,
              "Mark the order as handed over once the carrier has delivered it.",
            ];
      break;
    case "handed_over":
      subject = role === "buyer" ? `Handed over: ${order.title}` : `Handed over: ${order.title}`;
      lines =
        role === "buyer"
          ? [
              hello,
              `${yard} marked ${title} as handed over to you.`,
              `Please confirm on the order page that you have it and it is as described, or tell us there is a problem. If we hear nothing, the order completes by itself ${countOf(autoCompleteDays, "day", "days")} after hand-over.`,
            ]
          : [
              hello,
              `You marked ${title} as handed over to ${parties.buyerName}.`,
              `The order completes when the buyer confirms, or by itself ${countOf(autoCompleteDays, "day", "days")} after hand-over.`,
            ];
      break;
    case "completed":
      subject = `Completed: ${order.title}`;
      lines = [
        hello,
        order.completedBy === "automatic"
          ? `${title} is complete: ${countOf(autoCompleteDays, "day has", "days have")} passed since hand-over.`
          : role === "buyer"
            ? `Thank you for confirming that you have ${title}. The order is complete.`
            : `${parties.buyerName} confirmed receiving ${title}. The order is complete.`,
        role === "buyer"
          ? "Enjoy the build. Wood dust is a recognised carcinogen: work with dust extraction and a fitted respirator, and read the safety data sheet of any finish."
          : `Your net for this sale: ${formatMoney(order.sawyerNetMinor, order.currency)}.`,
        ...(role === "buyer"
          ? [`Tell other buyers how it went: review the order on its page (you can change your review for ${REVIEW_EDIT_DAYS} days).`]
          : []),
      ];
      break;
    case "cancelled": {
      const who = order.cancelledBy === role ? "You" : order.cancelledBy === "sawyer" ? yard : parties.buyerName;
      const refund =
        order.status === "refunded"
          ? `The full payment of ${formatMoney(order.totalMinor, order.currency)} has been refunded to the card.`
          : `The full payment of ${formatMoney(order.totalMinor, order.currency)} is being refunded to the card.`;
      subject = `Cancelled and refunded: ${order.title}`;
      lines = [
        hello,
        `${who} cancelled the order for ${title}.`,
        `Reason given: “${order.cancelReason ?? ""}”`,
        role === "buyer"
          ? `${refund} Banks usually show it within 5–10 business days.`
          : `${refund} The slab is back on sale in the catalogue.`,
      ];
      break;
    }
  }
  return { to: to.email, subject, ...layout(lines, { label: "Open the order", url: link }) };
}

// ---- Buyer tools: saved-search alerts and message notices ----

export interface AlertMailItem {
  title: string;
  priceMinor: number;
  currency: string;
  town: string | null;
  url: string;
}

/** New listings matching a saved search (one e-mail a day at most), with an unsubscribe link that needs no sign-in. */
export function savedSearchAlertMail(
  to: string,
  displayName: string,
  searchName: string,
  items: AlertMailItem[],
  searchUrl: string,
  unsubscribeUrl: string,
): OutgoingMail {
  const count = items.length === 1 ? "A new slab matches" : `${items.length} new slabs match`;
  const intro = `${count} your saved search "${searchName}":`;
  const line = (item: AlertMailItem) =>
    `${item.title} — ${formatMoney(item.priceMinor, item.currency)}${item.town ? `, ${item.town}` : ""}`;
  const footer = "— Grainyard, slabs from city trees";
  const text = [
    `Hello ${displayName},`,
    intro,
    ...items.map((item) => `${line(item)}\n${item.url}`),
    `See everything that matches: ${searchUrl}`,
    `We send at most one of these a day. Stop alerts for "${searchName}": ${unsubscribeUrl}`,
    "",
    footer,
  ].join("\n\n");
  const html = `<div style="font-family:Georgia,serif;color:#2b241c;max-width:560px"><p>${escape(`Hello ${displayName},`)}</p><p>${escape(intro)}</p><ul>${items
    .map((item) => `<li><a href="${escape(item.url)}">${escape(line(item))}</a></li>`)
    .join(
      "",
    )}</ul><p><a href="${escape(searchUrl)}" style="background:#6b3f1d;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">See everything that matches</a></p><p style="font-size:13px;color:#6d6256">We send at most one of these a day. <a href="${escape(unsubscribeUrl)}">Stop alerts for “${escape(searchName)}”</a>.</p><p style="font-size:13px;color:#6d6256">${footer}</p></div>`;
  return {
    to,
    subject: items.length === 1 ? `New slab for "${searchName}": ${items[0]!.title}` : `${items.length} new slabs for "${searchName}"`,
    text,
    html,
  };
}

/** A new message about a listing, for the other party: who wrote, a short excerpt, and the thread's link. */
export function messageNoticeMail(
  to: string,
  displayName: string,
  fromName: string,
  listingTitle: string,
  excerpt: string,
  link: string,
): OutgoingMail {
  return {
    to,
    subject: `New message about "${listingTitle}" from ${fromName}`,
    ...layout(
      [
        `Hello ${displayName},`,
        `${fromName} wrote about "${listingTitle}":`,
        `“${excerpt}”`,
        "Answer on Grainyard so the conversation stays with the listing.",
      ],
      { label: "Read and answer", url: link },
    ),
  };
}

/** A payout went out to the sawyer's payout account. */
export function payoutSentMail(
  sawyer: { email: string; displayName: string },
  payout: { amountMinor: number; currency: string },
  orderCount: number,
  link: string,
): OutgoingMail {
  return {
    to: sawyer.email,
    subject: `Grainyard sent you ${formatMoney(payout.amountMinor, payout.currency)}`,
    ...layout(
      [
        `Hello ${sawyer.displayName},`,
        `We sent ${formatMoney(payout.amountMinor, payout.currency)} to your payout account, for ${countOf(orderCount, "order", "orders")}.`,
        "Your payouts page has the statement of the orders it covers; it can take a few working days to reach your bank.",
      ],
      { label: "See the statement", url: link },
    ),
  };
}

/** An admin refunded all or part of a disputed order; both parties read the reason. */
export function disputeRefundMail(
  person: { email: string; displayName: string },
  side: "buyer" | "sawyer",
  order: { title: string; currency: string; totalMinor: number },
  amountMinor: number,
  reason: string,
  link: string,
): OutgoingMail {
  const amount = formatMoney(amountMinor, order.currency);
  const whole = amountMinor === order.totalMinor;
  return {
    to: person.email,
    subject: `${whole ? "Full" : "Partial"} refund on "${order.title}": ${amount}`,
    ...layout(
      [
        `Hello ${person.displayName},`,
        side === "buyer"
          ? `We refunded ${amount} of your order for "${order.title}" to your card. It usually shows within 5–10 working days.`
          : `We refunded ${amount} to the buyer of "${order.title}". Your share of it comes off the money Grainyard owes you for this order.`,
        "The reason our team gave:",
        `“${reason}”`,
        "Reply to this e-mail if you want to add anything.",
      ],
      { label: "See the order", url: link },
    ),
  };
}
