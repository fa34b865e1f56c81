import { z } from "zod";
import { PASSWORD_MAX_LENGTH } from "./accounts.ts";

/**
 * The second factor: a time-based code (RFC 6238, six digits every 30 seconds) from an authenticator
 * app, or one of ten single-use recovery codes given at set-up. Offered to sawyers, required for admins.
 */

/** How many recovery codes a set-up gives. */
export const RECOVERY_CODE_COUNT = 10;

/** A six-digit code from the app; spaces people type between the groups are dropped. */
export const TOTP_CODE_PATTERN = /^\d{6}$/;
/** A recovery code as we print it: two groups of five letters and digits (no look-alikes), dash optional. */
export const RECOVERY_CODE_PATTERN = /^[a-z2-9]{5}-?[a-z2-9]{5}$/;

const CODE_MESSAGE = "Enter the 6-digit code from your authenticator app, or one of your recovery codes.";

/** A code from the app or a recovery code, in whatever case and spacing it was typed. */
export const secondFactorCodeSchema = z
  .string({ error: CODE_MESSAGE })
  .transform((value) => value.replace(/\s+/g, "").toLowerCase())
  .pipe(z.string().refine((value) => TOTP_CODE_PATTERN.test(value) || RECOVERY_CODE_PATTERN.test(value), CODE_MESSAGE));

/** The second sign-in step (the password was right) and the set-up's confirmation. */
export const secondFactorCodeInputSchema = z.object({ code: secondFactorCodeSchema });
export type SecondFactorCodeInput = z.infer<typeof secondFactorCodeInputSchema>;

/** Confirming the set-up takes a code from the app only (a recovery code does not exist yet). */
export const secondFactorConfirmSchema = z.object({
  code: z
    .string({ error: "Enter the 6-digit code your app shows now." })
    .transform((value) => value.replace(/\s+/g, ""))
    .pipe(z.string().regex(TOTP_CODE_PATTERN, "Enter the 6-digit code your app shows now.")),
});
export type SecondFactorConfirmInput = z.infer<typeof secondFactorConfirmSchema>;

/** Removing it needs the password and a current code (or a recovery code, for a lost phone). */
export const secondFactorRemovalSchema = z.object({
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(PASSWORD_MAX_LENGTH),
  code: secondFactorCodeSchema,
});
export type SecondFactorRemovalInput = z.infer<typeof secondFactorRemovalSchema>;

/** Whether the account has a second factor on. */
export const secondFactorStatusSchema = z.object({
  on: z.boolean(),
  /** When it was switched on. */
  since: z.string().nullable(),
  /** Admins cannot use the desk without one. */
  required: z.boolean(),
  recoveryCodesLeft: z.number().int(),
});
export type SecondFactorStatus = z.infer<typeof secondFactorStatusSchema>;

/** A started set-up: the secret as a QR code (an SVG data URL made on the server) and as text to type in. */
export const secondFactorSetUpSchema = z.object({
  /** Base32, grouped by four for typing. */
  secret: z.string(),
  /** The otpauth:// address the QR code holds. */
  otpauthUrl: z.string(),
  qrCode: z.string(),
});
export type SecondFactorSetUp = z.infer<typeof secondFactorSetUpSchema>;

/** The set-up is confirmed: the recovery codes, shown this once. */
export const secondFactorRecoveryCodesSchema = z.object({
  status: secondFactorStatusSchema,
  recoveryCodes: z.array(z.string()).length(RECOVERY_CODE_COUNT),
});
export type SecondFactorRecoveryCodes = z.infer<typeof secondFactorRecoveryCodesSchema>;
