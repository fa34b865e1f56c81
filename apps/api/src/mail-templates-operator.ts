import type { OutgoingMail } from "./integrations/mail.ts";
import { layout } from "./mail-templates.ts";

/** E-mails of the operator desk: rejections, take-downs, suspension and restore. */

export function listingRejectedMail(to: string, displayName: string, title: string, reason: string, link: string): OutgoingMail {
  return {
    to,
    subject: `"${title}" was not accepted`,
    ...layout(
      [
        `Hello ${displayName},`,
        `Our reviewer looked at "${title}" and cannot accept it on Grainyard:`,
        `“${reason}”`,
        "The slabs are back in your yard and free for another listing. Reply to this e-mail if you think this is a mistake.",
      ],
      { label: "See the listing", url: link },
    ),
  };
}

export function listingTakenDownMail(to: string, displayName: string, title: string, reason: string, link: string): OutgoingMail {
  return {
    to,
    subject: `"${title}" was taken down`,
    ...layout(
      [
        `Hello ${displayName},`,
        `After a report, we took "${title}" off Grainyard:`,
        `“${reason}”`,
        "Reply to this e-mail if you think this is a mistake.",
      ],
      { label: "See the listing", url: link },
    ),
  };
}

export function accountSuspendedMail(to: string, displayName: string, reason: string): OutgoingMail {
  return {
    to,
    subject: "Your Grainyard account is suspended",
    ...layout([
      `Hello ${displayName},`,
      "We have suspended your Grainyard account. You cannot sign in while it is suspended, your listings are hidden and any slab you had reserved was released.",
      `The reason: “${reason}”`,
      "Reply to this e-mail to talk to us about it.",
    ]),
  };
}

export function accountRestoredMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "Your Grainyard account is open again",
    ...layout(
      [`Hello ${displayName},`, "Your account is restored: you can sign in again, and listings that were live are back in the catalogue."],
      { label: "Sign in", url: link },
    ),
  };
}
