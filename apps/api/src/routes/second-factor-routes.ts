import type { secondFactorEndpoints } from "@grainyard/contracts";
import { sessionOf } from "../http/context.ts";
import { secondFactorAttemptOf } from "../http/rate-limits.ts";
import type { Handlers } from "../http/endpoints.ts";
import type { AccountService } from "../services/account-service.ts";
import type { SecondFactorService } from "../services/second-factor-service.ts";
import { newToken } from "../services/tokens.ts";

/** The sign-in's code step and a sawyer's or admin's second-factor set-up and removal. */
export function secondFactorHandlers(accounts: AccountService, secondFactor: SecondFactorService): Handlers<typeof secondFactorEndpoints> {
  return {
    signInSecondStep: async ({ body, req }) => {
      const { account, sessionKey } = await accounts.signInSecondStep(sessionOf(req).pending, body.code);
      await secondFactorAttemptOf(req)?.succeeded();
      // The code step is over: a real session with a fresh anti-forgery token.
      req.session = { key: sessionKey, csrf: newToken() };
      return { account, csrfToken: sessionOf(req).csrf!, secondStep: null, secondFactorSetUpNeeded: false };
    },
    getSecondFactor: ({ actor }) => secondFactor.status(actor),
    startSecondFactorSetUp: ({ actor }) => secondFactor.startSetUp(actor),
    confirmSecondFactor: async ({ actor, body, req }) => {
      const answer = await secondFactor.confirmSetUp(actor, body.code);
      await secondFactorAttemptOf(req)?.succeeded();
      return answer;
    },
    removeSecondFactor: async ({ actor, body, req }) => {
      const answer = await secondFactor.remove(actor, body);
      await secondFactorAttemptOf(req)?.succeeded();
      return answer;
    },
  };
}
