import { orderProblemKindLabels, type OrderProblemKind } from "@grainyard/contracts";
import { formatMoney } from "@grainyard/slab-math";
import type { OutgoingMail } from "./integrations/mail.ts";
import { layout } from "./mail-templates.ts";

/** E-mails about a problem a buyer reported after hand-over: to the sawyer, the desk and the buyer, then how the desk settled it. */

interface ProblemFacts {
  kind: OrderProblemKind;
  comment: string;
}
interface OrderFacts {
  title: string;
  currency: string;
  totalMinor: number;
}
type Person = { email: string; displayName: string };

const kindWords = (kind: OrderProblemKind) => orderProblemKindLabels[kind].replace(/^I have/, "they have").replace(/^It/, "it");

/** The buyer's receipt: the desk has it, and the order waits meanwhile. */
export function problemReceivedMail(buyer: Person, order: OrderFacts, problem: ProblemFacts, link: string): OutgoingMail {
  return {
    to: buyer.email,
    subject: `We have your problem report: ${order.title}`,
    ...layout(
      [
        `Hello ${buyer.displayName},`,
        `You told us there is a problem with "${order.title}" (${orderProblemKindLabels[problem.kind].toLowerCase()}). Our desk looks at it and writes to you and the sawyer; the order will not complete by itself meanwhile.`,
        "What you wrote:",
        `“${problem.comment}”`,
      ],
      { label: "See the order", url: link },
    ),
  };
}

/** The sawyer hears of it, with the buyer's words, and that the sale waits for the desk. */
export function problemReportedSawyerMail(
  sawyer: Person,
  buyerName: string,
  order: OrderFacts,
  problem: ProblemFacts,
  link: string,
): OutgoingMail {
  return {
    to: sawyer.email,
    subject: `The buyer reported a problem: ${order.title}`,
    ...layout(
      [
        `Hello ${sawyer.displayName},`,
        `${buyerName} says ${kindWords(problem.kind)}: "${order.title}". The order waits for our desk, which decides whether the buyer gets money back; your share of this sale is held until then.`,
        "What the buyer wrote:",
        `“${problem.comment}”`,
        "Reply to this e-mail to tell the desk your side (photos of the hand-over or the slab help).",
      ],
      { label: "See the order", url: link },
    ),
  };
}

/** Each admin: a new case on the desk. */
export function problemReportedDeskMail(
  admin: Person,
  parties: { buyerName: string; yardName: string },
  order: OrderFacts,
  problem: ProblemFacts,
  link: string,
): OutgoingMail {
  return {
    to: admin.email,
    subject: `Problem reported on "${order.title}" (${formatMoney(order.totalMinor, order.currency)})`,
    ...layout(
      [
        `Hello ${admin.displayName},`,
        `${parties.buyerName} reported a problem with "${order.title}" from ${parties.yardName}: ${orderProblemKindLabels[problem.kind].toLowerCase()}.`,
        `“${problem.comment}”`,
        "Settle it on the desk: refund all or part, or release the sale to the sawyer.",
      ],
      { label: "Open the problems list", url: link },
    ),
  };
}

/** To the buyer and the sawyer: how the desk settled it, in the desk's words. */
export function problemSettledMail(
  person: Person,
  side: "buyer" | "sawyer",
  order: OrderFacts,
  outcome: { refundedMinor: number | null; note: string },
  link: string,
): OutgoingMail {
  const refunded = outcome.refundedMinor ? formatMoney(outcome.refundedMinor, order.currency) : null;
  const whole = outcome.refundedMinor === order.totalMinor;
  const lines = refunded
    ? side === "buyer"
      ? [
          `We refunded ${refunded} of "${order.title}" to your card${whole ? "" : "; the rest of the sale stands"}. It usually shows within 5–10 working days.`,
        ]
      : [
          `We refunded ${refunded} to the buyer of "${order.title}"${whole ? "" : "; the rest of the sale is yours"}. Your share of the refund comes off what Grainyard owes you for this order.`,
        ]
    : side === "buyer"
      ? [`We looked at the problem you reported with "${order.title}" and released the sale to the sawyer: the order is complete.`]
      : [`We looked at the problem the buyer reported with "${order.title}" and released the sale to you: the order is complete.`];
  return {
    to: person.email,
    subject: refunded ? `Problem settled with a refund of ${refunded}: ${order.title}` : `Problem settled, order complete: ${order.title}`,
    ...layout([`Hello ${person.displayName},`, ...lines, "Our desk's reason:", `“${outcome.note}”`], { label: "See the order", url: link }),
  };
}
