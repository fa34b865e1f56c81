import type { accountEndpoints } from "@grainyard/contracts";
import type { Actor } from "../services/actor.ts";
import type { Request } from "express";
import { sessionOf } from "../http/context.ts";
import { signInAttemptOf } from "../http/rate-limits.ts";
import type { Handlers } from "../http/endpoints.ts";
import type { AccountService } from "../services/account-service.ts";
import { newToken } from "../services/tokens.ts";

/** The session's anti-forgery token, created on first use. */
function csrfTokenFor(req: Request): string {
  const session = sessionOf(req);
  if (!session.csrf) {
    session.csrf = newToken();
    req.session = session;
  }
  return session.csrf;
}

/** The session's state beside the account: a code step awaited, or an admin's second factor still to set up. */
function sessionExtras(req: Request, actor: Actor, at: number) {
  const pending = sessionOf(req).pending;
  return {
    secondStep: pending && pending.until > at ? { email: pending.email, until: new Date(pending.until).toISOString() } : null,
    secondFactorSetUpNeeded: actor.kind === "account" && actor.secondFactorSetUpNeeded === true,
  };
}

/** Sign-in, sign-up, e-mail confirmation, password reset and the yard profile: each calls one service function. */
export function accountHandlers(accounts: AccountService, now: () => Date): Handlers<typeof accountEndpoints> {
  return {
    getSession: async ({ actor, req }) => ({
      account: await accounts.currentAccount(actor),
      csrfToken: csrfTokenFor(req),
      ...sessionExtras(req, actor, now().getTime()),
    }),
    signIn: async ({ body, req }) => {
      const outcome = await accounts.signIn(body, signInAttemptOf(req));
      if (outcome.kind === "code_needed") {
        // No session yet: the signed cookie remembers whose code is awaited, for a few minutes.
        req.session = { csrf: newToken(), pending: outcome.secondStep };
        const { email, until } = outcome.secondStep;
        return {
          account: null,
          csrfToken: sessionOf(req).csrf!,
          secondStep: { email, until: new Date(until).toISOString() },
          secondFactorSetUpNeeded: false,
        };
      }
      // A fresh anti-forgery token with every new session.
      req.session = { key: outcome.sessionKey, csrf: newToken() };
      // Signed in at once means no second factor is on: an admin must set one up before anything else.
      return {
        account: outcome.account,
        csrfToken: sessionOf(req).csrf!,
        secondStep: null,
        secondFactorSetUpNeeded: outcome.account.role === "admin",
      };
    },
    signOut: async ({ actor, req }) => {
      await accounts.signOut(actor);
      req.session = { csrf: newToken() };
      return { account: null, csrfToken: sessionOf(req).csrf!, secondStep: null, secondFactorSetUpNeeded: false };
    },
    signUp: async ({ actor, body }) => {
      // The same answer whether or not the address has an account already (its owner gets an e-mail).
      await accounts.signUp(actor, body);
      return { message: "Check your inbox: we sent a link to confirm your address." };
    },
    verifyEmail: ({ body }) => accounts.verifyEmail(body),
    resendVerification: async ({ actor }) => {
      await accounts.resendVerification(actor);
      return { sent: true };
    },
    requestPasswordReset: ({ body }) => {
      accounts.requestPasswordReset(body);
      return { message: "If that address has a Grainyard account, a reset link is on its way." };
    },
    resetPassword: async ({ body }) => {
      await accounts.resetPassword(body);
      return { reset: true };
    },
    getOwnYard: async ({ actor }) => ({ account: await accounts.ownYard(actor) }),
    updateYard: async ({ actor, params, body }) => ({ account: await accounts.updateYard(actor, params.sawyerId, body) }),
  };
}
