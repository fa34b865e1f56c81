import { Router } from "express";
import {
  passwordResetRequestSchema,
  passwordResetSchema,
  signInSchema,
  signUpSchema,
  userSearchSchema,
  verifyEmailSchema,
  yardProfileUpdateSchema,
} from "@grainyard/contracts";
import type { RequestHandler } from "express";
import { newToken } from "../services/tokens.ts";
import type { AccountService } from "../services/account-service.ts";
import { parse, sessionOf } from "../http/context.ts";
import type { Request } from "express";

/** The session's anti-forgery token, created on first use. */
function csrfTokenFor(req: Request): string {
  const session = sessionOf(req);
  if (!session.csrf) {
    session.csrf = newToken();
    req.session = session;
  }
  return session.csrf;
}

/** Routes stay thin: parse with the shared schema, take the actor, call one service function. */
export function accountRoutes(accounts: AccountService, limits: { signIn: RequestHandler[]; passwordReset: RequestHandler[] }) {
  const router = Router();

  router.get("/session", async (req, res) => {
    res.json({ account: await accounts.currentAccount(req.actor), csrfToken: csrfTokenFor(req) });
  });

  router.post("/session", ...limits.signIn, async (req, res) => {
    const input = parse(signInSchema, req.body);
    const { account, sessionKey } = await accounts.signIn(input);
    // A fresh anti-forgery token with every new session.
    req.session = { key: sessionKey, csrf: newToken() };
    res.json({ account, csrfToken: sessionOf(req).csrf });
  });

  router.delete("/session", async (req, res) => {
    await accounts.signOut(req.actor);
    req.session = { csrf: newToken() };
    res.json({ account: null, csrfToken: sessionOf(req).csrf });
  });

  router.post("/accounts", async (req, res) => {
    const account = await accounts.signUp(req.actor, parse(signUpSchema, req.body));
    res.status(201).json({ account });
  });

  router.post("/email-verification", async (req, res) => {
    res.json(await accounts.verifyEmail(parse(verifyEmailSchema, req.body)));
  });

  router.post("/email-verification/resend", async (req, res) => {
    await accounts.resendVerification(req.actor);
    res.status(202).json({ sent: true });
  });

  router.post("/password-reset-requests", ...limits.passwordReset, async (req, res) => {
    await accounts.requestPasswordReset(parse(passwordResetRequestSchema, req.body));
    res.status(202).json({ message: "If that address has a Grainyard account, a reset link is on its way." });
  });

  router.post("/password-resets", async (req, res) => {
    await accounts.resetPassword(parse(passwordResetSchema, req.body));
    res.json({ reset: true });
  });

  router.get("/yard", async (req, res) => {
    res.json({ account: await accounts.ownYard(req.actor) });
  });

  router.patch("/yards/:sawyerId", async (req, res) => {
    res.json({ account: await accounts.updateYard(req.actor, String(req.params.sawyerId), parse(yardProfileUpdateSchema, req.body)) });
  });

  router.get("/admin/accounts", async (req, res) => {
    res.json({ accounts: await accounts.searchAccounts(req.actor, parse(userSearchSchema, req.query)) });
  });

  return router;
}
