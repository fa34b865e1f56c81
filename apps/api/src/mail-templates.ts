import type { OutgoingMail } from "./integrations/mail.ts";

/** The words of every e-mail Grainyard sends, in one place. Plain text first; the HTML mirrors it. */
function layout(paragraphs: string[], action?: { label: string; url: string }): { text: string; html: string } {
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
