import {
  secondFactorCodeInputSchema,
  secondFactorConfirmSchema,
  secondFactorRecoveryCodesSchema,
  secondFactorRemovalSchema,
  secondFactorSetUpSchema,
  secondFactorStatusSchema,
} from "../second-factor.ts";
import { sessionSchema } from "../accounts.ts";
import { endpoint } from "../endpoint.ts";
import { API_PREFIX } from "./prefix.ts";

/** The second factor: the sign-in's code step, and a sawyer's or admin's set-up and removal. */
export const secondFactorEndpoints = {
  signInSecondStep: endpoint({
    method: "POST",
    path: `${API_PREFIX}/session/second-factor`,
    summary: "The second step of signing in: a code from the app or a recovery code, after the password was right.",
    access: "anyone",
    body: secondFactorCodeInputSchema,
    answer: sessionSchema,
    limit: "second_factor",
    errors: ["second_factor_wrong", "second_factor_used", "second_step_expired", "account_suspended"],
  }),
  getSecondFactor: endpoint({
    method: "GET",
    path: `${API_PREFIX}/account/second-factor`,
    summary: "Whether the signed-in sawyer or admin has a second factor on, and how many recovery codes are left.",
    access: ["sawyer", "admin"],
    answer: secondFactorStatusSchema,
    beforeSecondFactor: true,
  }),
  startSecondFactorSetUp: endpoint({
    method: "POST",
    path: `${API_PREFIX}/account/second-factor/set-up`,
    summary: "Start (or restart) the set-up: a new secret as a QR code and as text; nothing is on until confirmed.",
    access: ["sawyer", "admin"],
    answer: secondFactorSetUpSchema,
    errors: ["second_factor_on"],
    beforeSecondFactor: true,
  }),
  confirmSecondFactor: endpoint({
    method: "POST",
    path: `${API_PREFIX}/account/second-factor`,
    summary: "Switch the second factor on with a first code from the app; answers the ten recovery codes, shown this once.",
    access: ["sawyer", "admin"],
    body: secondFactorConfirmSchema,
    answer: secondFactorRecoveryCodesSchema,
    status: 201,
    limit: "second_factor",
    errors: ["second_factor_wrong", "second_factor_used", "second_factor_on", "second_factor_not_started"],
    beforeSecondFactor: true,
  }),
  removeSecondFactor: endpoint({
    method: "POST",
    path: `${API_PREFIX}/account/second-factor/removal`,
    summary: "Switch the second factor off, with the password and a current code (an admin must then set it up again).",
    access: ["sawyer", "admin"],
    body: secondFactorRemovalSchema,
    answer: secondFactorStatusSchema,
    limit: "second_factor",
    errors: ["wrong_password", "second_factor_wrong", "second_factor_used", "second_factor_off"],
  }),
} as const;
