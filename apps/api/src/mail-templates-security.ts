import type { OutgoingMail } from "./integrations/mail.ts";
import { layout } from "./mail-templates.ts";

/** E-mails about an account's second factor: switched on, switched off, a recovery code used. */

export function secondFactorOnMail(to: string, displayName: string, link: string): OutgoingMail {
  return {
    to,
    subject: "A second factor is now on for your Grainyard account",
    ...layout(
      [
        `Hello ${displayName},`,
        "Signing in to your Grainyard account now takes a code from your authenticator app after the password.",
        "Keep the ten recovery codes you were shown somewhere safe and apart from your phone: each works once if the phone is lost.",
        "If you did not do this, reset your password at once and reply to this e-mail.",
      ],
      { label: "See your account's security", url: link },
    ),
  };
}

export function secondFactorOffMail(to: string, displayName: string, link: string, adminMustRedo: boolean): OutgoingMail {
  return {
    to,
    subject: "The second factor was removed from your Grainyard account",
    ...layout(
      [
        `Hello ${displayName},`,
        "Signing in to your Grainyard account no longer asks for a code from an authenticator app. Your old recovery codes no longer work.",
        ...(adminMustRedo ? ["As an admin you must set up a new one before you can use the desk again."] : []),
        "If you did not do this, reset your password at once and reply to this e-mail.",
      ],
      { label: "Set up a second factor", url: link },
    ),
  };
}

export function recoveryCodeUsedMail(to: string, displayName: string, left: number, link: string): OutgoingMail {
  return {
    to,
    subject: "A recovery code was used to sign in to Grainyard",
    ...layout(
      [
        `Hello ${displayName},`,
        `Someone signed in to your Grainyard account with one of its recovery codes. ${left === 1 ? "1 code is" : `${left} codes are`} left.`,
        "If your phone is lost, remove the second factor and set it up again on your new phone: that gives you ten fresh codes.",
        "If it was not you, reset your password at once and reply to this e-mail.",
      ],
      { label: "See your account's security", url: link },
    ),
  };
}
