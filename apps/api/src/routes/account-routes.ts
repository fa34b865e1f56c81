import type { accountEndpoints } from "@grainyard/contracts";
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

/** Sign-in, sign-up, e-mail confirmation, password reset and the yard profile: each calls one service function. */
export function accountHandlers(accounts: AccountService): Handlers<typeof accountEndpoints> {
  return {
    getSession: async ({ actor, req }) => ({ account: await accounts.currentAccount(actor), csrfToken: csrfTokenFor(req) }),
    signIn: async ({ body, req }) => {
      const { account, sessionKey } = await accounts.signIn(body, signInAttemptOf(req));
      // A fresh anti-forgery token with every new session.
      req.session = { key: sessionKey, csrf: newToken() };
      return { account, csrfToken: sessionOf(req).csrf! };
    },
    signOut: async ({ actor, req }) => {
      await accounts.signOut(actor);
      req.session = { csrf: newToken() };
      return { account: null, csrfToken: sessionOf(req).csrf! };
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
