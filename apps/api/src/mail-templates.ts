import type { OutgoingMail } from "./integrations/mail.ts";

/** The words of every e-mail Grainyard sends, in one place. Plain text first; the HTML mirrors it. */
export function layout(paragraphs: string[], action?: { label: string; url: string }): { text: string; html: string } {
  const escape = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);
  const text = [...paragraphs, ...(action ? [`${action.label}: ${action.url}`] : []), "", "— Grainyard, slabs from city trees"].join("\n\n");
  const html = `<div style="font-family:Georgia,serif;color:#2b241c;max-width:560px">${paragraphs.map((p) => `<p>${escape(p)}</p>`).join("")}${
    action ? `<p><a href="${escape(action.url)}" style="background:#6b3f1d;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escape(action.label)}</a></p><p style="font-size:13px;color:#6d6256">Or paste this address into your browser: ${escape(action.url)}</p>` : ""
  }<p style="font-size:13px;color:#6d6256">— Grainyard, slabs from city trees</p></div>`;
  return { text, html };
}

export function verificationMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "Confirm your e-mail for Grainyard",
    ...layout(
      [`Hello ${displayName},`, "Please confirm this address so we know it reaches you. The link works once and expires in 48 hours.", "If you did not sign up, you can ignore this e-mail."],
      { label: "Confirm my e-mail", url: link },
    ),
  };
}

export function passwordResetMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "Reset your Grainyard password",
    ...layout(
      [`Hello ${displayName},`, "Someone asked to reset the password of this Grainyard account. The link works once and expires in 1 hour.", "If it was not you, ignore this e-mail: your password stays as it is."],
      { label: "Choose a new password", url: link },
    ),
  };
}

export function listingApprovedMail(to: string, displayName: string, title: string, link: string): OutgoingMail {
  return {
    to,
    subject: `Your listing is live: ${title}`,
    ...layout([`Hello ${displayName},`, `Good news: "${title}" passed review and is now live on Grainyard. Buyers can find it from today.`], { label: "See the listing", url: link }),
  };
}

export function listingSentBackMail(to: string, displayName: string, title: string, reason: string, link: string): OutgoingMail {
  return {
    to,
    subject: `Changes needed before "${title}" goes live`,
    ...layout(
      [`Hello ${displayName},`, `Our reviewer looked at "${title}" and asks for a change before it goes live:`, `“${reason}”`, "Edit the listing and submit it again; it comes straight back to the review list."],
      { label: "Edit the listing", url: link },
    ),
  };
}

const moneyText = (minor: number, currency: string) => new Intl.NumberFormat("en", { style: "currency", currency }).format(minor / 100);

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
  slabSnapshot: Record<string, unknown>[];
}

function slabLines(order: OrderForMail): string[] {
  return order.slabSnapshot.map((slab, index) => {
    const figures = slab.figures as { boardFeet: number; weightHighKg: number } | undefined;
    return `Slab ${index + 1}: ${String(slab.lengthMm)} × ${Math.round(Number((slab.figures as { averageWidthMm?: number } | undefined)?.averageWidthMm ?? 0))} × ${String(slab.thicknessMm)} mm, ${figures ? figures.boardFeet.toFixed(1) : "?"} board feet, up to ${figures ? Math.round(figures.weightHighKg) : "?"} kg`;
  });
}

export function orderPaidBuyerMail(buyer: { email: string; displayName: string }, sawyer: { yardName: string | null; pickupTown: string | null }, order: OrderForMail, link: string): OutgoingMail {
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
        ...slabLines(order),
        `Price ${moneyText(order.priceMinor, order.currency)} · tax ${moneyText(order.taxMinor, order.currency)} · total paid ${moneyText(order.totalMinor, order.currency)}.`,
        handover,
        "Slabs are heavy: lift with two people or a machine, secure the load, and keep to local load and vehicle limits.",
      ],
      { label: "See your order and receipt", url: link },
    ),
  };
}

export function orderPaidSawyerMail(sawyer: { email: string; displayName: string }, buyer: { displayName: string }, order: OrderForMail, link: string): OutgoingMail {
  return {
    to: sawyer.email,
    subject: `Sold: ${order.title}`,
    ...layout(
      [
        `Hello ${sawyer.displayName},`,
        `${buyer.displayName} bought "${order.title}" and the payment is confirmed.`,
        `Price ${moneyText(order.priceMinor, order.currency)} − platform fee ${moneyText(order.platformFeeMinor, order.currency)} − card processing ${moneyText(order.processingFeeMinor, order.currency)} = your net ${moneyText(order.sawyerNetMinor, order.currency)}.`,
        order.handover === "pickup" ? "The buyer collects from your yard: propose pickup times from the order page." : `Freight to: ${order.deliveryAddress ?? ""}. Add the carrier and tracking reference on the order page.`,
      ],
      { label: "Open the order", url: link },
    ),
  };
}

// ---- Buyer tools: saved-search alerts and message notices ----

function escapeHtmlText(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}
function priceText(minor: number, currency: string): string {
  return new Intl.NumberFormat("en", { style: "currency", currency }).format(minor / 100);
}

export interface AlertMailItem {
  title: string;
  priceMinor: number;
  currency: string;
  town: string | null;
  url: string;
}

/** New listings matching a saved search (one e-mail a day at most), with an unsubscribe link that needs no sign-in. */
export function savedSearchAlertMail(to: string, displayName: string, searchName: string, items: AlertMailItem[], searchUrl: string, unsubscribeUrl: string): OutgoingMail {
  const count = items.length === 1 ? "A new slab matches" : `${items.length} new slabs match`;
  const intro = `${count} your saved search "${searchName}":`;
  const line = (item: AlertMailItem) => `${item.title} — ${priceText(item.priceMinor, item.currency)}${item.town ? `, ${item.town}` : ""}`;
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
  const html = `<div style="font-family:Georgia,serif;color:#2b241c;max-width:560px"><p>${escapeHtmlText(`Hello ${displayName},`)}</p><p>${escapeHtmlText(intro)}</p><ul>${items
    .map((item) => `<li><a href="${escapeHtmlText(item.url)}">${escapeHtmlText(line(item))}</a></li>`)
    .join("")}</ul><p><a href="${escapeHtmlText(searchUrl)}" style="background:#6b3f1d;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">See everything that matches</a></p><p style="font-size:13px;color:#6d6256">We send at most one of these a day. <a href="${escapeHtmlText(unsubscribeUrl)}">Stop alerts for “${escapeHtmlText(searchName)}”</a>.</p><p style="font-size:13px;color:#6d6256">${footer}</p></div>`;
  return { to, subject: items.length === 1 ? `New slab for "${searchName}": ${items[0]!.title}` : `${items.length} new slabs for "${searchName}"`, text, html };
}

/** A new message about a listing, for the other party: who wrote, a short excerpt, and the thread's link. */
export function messageNoticeMail(to: string, displayName: string, fromName: string, listingTitle: string, excerpt: string, link: string): OutgoingMail {
  return {
    to,
    subject: `New message about "${listingTitle}" from ${fromName}`,
    ...layout([`Hello ${displayName},`, `${fromName} wrote about "${listingTitle}":`, `“${excerpt}”`, "Answer on Grainyard so the conversation stays with the listing."], { label: "Read and answer", url: link }),
  };
}
