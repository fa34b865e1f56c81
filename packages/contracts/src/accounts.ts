import { z } from "zod";
import { hasLetter, isPrintableLine, UNPRINTABLE_MESSAGE } from "./common.ts";

export const roles = ["buyer", "sawyer", "admin"] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

/** Roles a person may choose when signing up. Admins come only from the seed or the CLI. */
export const selfServiceRoles = ["buyer", "sawyer"] as const;

export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 200;

export const emailSchema = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter a valid e-mail address, like name@example.org." }));

export const newPasswordSchema = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(PASSWORD_MAX_LENGTH, `Use at most ${PASSWORD_MAX_LENGTH} characters.`);

// Names other people see: one line of ordinary text (no CR/LF, control characters or direction overrides).
const displayNameSchema = z
  .string({ error: "Tell us your name." })
  .trim()
  .min(1, "Tell us your name.")
  .max(80, "Keep your name under 80 characters.")
  .refine(isPrintableLine, UNPRINTABLE_MESSAGE);

export const yardNameSchema = z
  .string({ error: "Give your yard a name." })
  .trim()
  .min(2, "Give your yard a name of at least 2 characters.")
  .max(80, "Keep the yard name under 80 characters.")
  .refine(isPrintableLine, UNPRINTABLE_MESSAGE);

export const pickupTownSchema = z
  .string({ error: "Say which town buyers collect from." })
  .trim()
  .min(2, "Say which town buyers collect from.")
  .max(80, "Keep the town under 80 characters.")
  .refine(isPrintableLine, UNPRINTABLE_MESSAGE)
  .refine(hasLetter, "Give the town's name in letters.");

const buyerSignUpSchema = z.object({
  role: z.literal("buyer"),
  email: emailSchema,
  password: newPasswordSchema,
  displayName: displayNameSchema,
});

const sawyerSignUpSchema = z.object({
  role: z.literal("sawyer"),
  email: emailSchema,
  password: newPasswordSchema,
  displayName: displayNameSchema,
  yardName: yardNameSchema,
  pickupTown: pickupTownSchema,
});

/** Sign-up body: a buyer, or a sawyer who also names the yard and pickup town. */
export const signUpSchema = z.discriminatedUnion("role", [buyerSignUpSchema, sawyerSignUpSchema], {
  error: "Choose whether you buy slabs or sell them.",
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(PASSWORD_MAX_LENGTH),
});
export type SignInInput = z.infer<typeof signInSchema>;

const tokenSchema = z
  .string({ error: "The link is missing its token." })
  .trim()
  .min(20, "That link is incomplete. Copy the whole link from the e-mail.")
  .max(200, "That link is not one of ours.");

export const verifyEmailSchema = z.object({ token: tokenSchema });
export type VerifyEmailInput = z.infer<typeof verifyEmailSchema>;

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

export const passwordResetSchema = z.object({ token: tokenSchema, password: newPasswordSchema });
export type PasswordResetInput = z.infer<typeof passwordResetSchema>;

/** What a sawyer tells buyers on the yard's public page (paragraphs allowed). */
export const yardStorySchema = z
  .string({ error: "Tell buyers about your yard in words." })
  .trim()
  .max(2000, "Keep the story under 2000 characters.");

export const yardProfileUpdateSchema = z
  .object({ yardName: yardNameSchema, pickupTown: pickupTownSchema, yardStory: yardStorySchema })
  .partial()
  .refine((value) => Object.keys(value).length > 0, "Change at least one field.");
export type YardProfileUpdateInput = z.infer<typeof yardProfileUpdateSchema>;

/** A signed-in person as the API shows them to themselves (and to admins). */
export const accountSchema = z.object({
  id: z.string(),
  email: z.string(),
  displayName: z.string(),
  role: roleSchema,
  emailVerified: z.boolean(),
  yardName: z.string().nullable(),
  /** The address of the yard's public page (`/yards/<slug>`). */
  yardSlug: z.string().nullable(),
  yardStory: z.string().nullable(),
  pickupTown: z.string().nullable(),
  createdAt: z.string(),
});
export type Account = z.infer<typeof accountSchema>;

export const sessionSchema = z.object({
  account: accountSchema.nullable(),
  csrfToken: z.string(),
  /**
   * Set between the two steps of signing in to an account with a second factor: the password was
   * right and the code is awaited (no one is signed in yet). Lasts a few minutes.
   */
  secondStep: z.object({ email: z.string(), until: z.string() }).nullable().default(null),
  /** A signed-in admin without a second factor: only the set-up (and signing out) is open until it is on. */
  secondFactorSetUpNeeded: z.boolean().default(false),
});
export type SessionState = z.infer<typeof sessionSchema>;

/** `{ account }`: the answer of sign-up, own yard and yard update. */
export const accountEnvelopeSchema = z.object({ account: accountSchema });
export type AccountEnvelope = z.infer<typeof accountEnvelopeSchema>;

/** The answer of a used confirmation link. */
export const emailVerifiedSchema = z.object({ verified: z.literal(true) });
