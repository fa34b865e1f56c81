import { formatMoney } from "@grainyard/slab-math";
import type { OutgoingMail } from "./integrations/mail.ts";
import { layout } from "./mail-templates.ts";

/** E-mails about offers: one for whoever must act next at each step, and the outcome for the buyer. */

interface Person {
  email: string;
  displayName: string;
}
interface OfferFacts {
  title: string;
  currency: string;
  link: string;
}

const money = (minor: number, facts: OfferFacts) => formatMoney(minor, facts.currency);
const quoted = (message: string) => (message ? [`“${message}”`] : []);

export function offerReceivedMail(
  to: Person,
  buyerName: string,
  amountMinor: number,
  message: string,
  round: number,
  facts: OfferFacts,
): OutgoingMail {
  return {
    to: to.email,
    subject: `${round > 1 ? "New offer" : "An offer"} of ${money(amountMinor, facts)} on "${facts.title}"`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `${buyerName} offers ${money(amountMinor, facts)} for "${facts.title}".`,
        ...quoted(message),
        "You may accept it, decline it or name your own amount, within 48 hours; after that it expires.",
      ],
      { label: "Answer the offer", url: facts.link },
    ),
  };
}

export function offerBelowFloorMail(to: Person, amountMinor: number, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `Your offer on "${facts.title}"`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `Thank you for your offer of ${money(amountMinor, facts)} for "${facts.title}". The sawyer is not taking offers this low on this slab, so it was declined.`,
        "You are welcome to offer again nearer the asking price, or buy it as listed.",
      ],
      { label: "See the slab", url: facts.link },
    ),
  };
}

export function offerCounteredMail(to: Person, yardName: string, counterMinor: number, message: string, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `${yardName} answered your offer on "${facts.title}" with ${money(counterMinor, facts)}`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `${yardName} would sell "${facts.title}" to you for ${money(counterMinor, facts)}.`,
        ...quoted(message),
        "You may accept it and pay, offer again, or withdraw, within 48 hours; after that it expires.",
      ],
      { label: "Answer the counter", url: facts.link },
    ),
  };
}

export function offerAcceptedBuyerMail(to: Person, yardName: string, agreedMinor: number, payBy: Date, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `Offer accepted: "${facts.title}" for ${money(agreedMinor, facts)}`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `${yardName} accepted ${money(agreedMinor, facts)} for "${facts.title}". The slab is held for you at that price until ${payBy.toUTCString()}.`,
        "Pay on the order page with your card; if the hold runs out first, the slab goes back on sale.",
      ],
      { label: "Pay for the slab", url: facts.link },
    ),
  };
}

export function counterAcceptedSawyerMail(to: Person, buyerName: string, agreedMinor: number, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `${buyerName} accepted your ${money(agreedMinor, facts)} for "${facts.title}"`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        `${buyerName} accepted your counter of ${money(agreedMinor, facts)} for "${facts.title}". The slab is held for them while they pay; you hear from us again once they have.`,
      ],
      { label: "See the order", url: facts.link },
    ),
  };
}

const closedReasons = {
  sawyer: "the sawyer declined it",
  other_offer_accepted: "the sawyer accepted another offer on this slab",
  slab_sold: "the slab was sold",
} as const;

export function offerDeclinedMail(to: Person, reason: keyof typeof closedReasons, message: string, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `Your offer on "${facts.title}" was declined`,
    ...layout([`Hello ${to.displayName},`, `Your offer on "${facts.title}" is closed: ${closedReasons[reason]}.`, ...quoted(message)], {
      label: "See your offers",
      url: facts.link,
    }),
  };
}

export function offerWithdrawnMail(to: Person, buyerName: string, facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `${buyerName} withdrew their offer on "${facts.title}"`,
    ...layout([`Hello ${to.displayName},`, `${buyerName} withdrew their offer on "${facts.title}". Nothing more is needed from you.`], {
      label: "See your offers",
      url: facts.link,
    }),
  };
}

export function offerExpiredMail(to: Person, waitedOn: "you" | "them", facts: OfferFacts): OutgoingMail {
  return {
    to: to.email,
    subject: `The offer on "${facts.title}" expired`,
    ...layout(
      [
        `Hello ${to.displayName},`,
        waitedOn === "you"
          ? `The offer on "${facts.title}" waited 48 hours for your answer and has expired.`
          : `The offer on "${facts.title}" was not answered within 48 hours and has expired.`,
      ],
      { label: "See your offers", url: facts.link },
    ),
  };
}
