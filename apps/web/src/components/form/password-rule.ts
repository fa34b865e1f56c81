import { PASSWORD_MIN_LENGTH } from "@grainyard/contracts";

/** The password rule, said the same way everywhere a password is chosen. */
export const PASSWORD_RULE = `At least ${PASSWORD_MIN_LENGTH} characters, and not a common password. A short sentence works well.`;
