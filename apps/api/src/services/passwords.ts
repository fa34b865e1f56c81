import { dictionary } from "@zxcvbn-ts/language-common";
import bcrypt from "bcryptjs";

// The common-password list of @zxcvbn-ts/language-common (about 49 000 leaked passwords, ranked).
const commonPasswords = new Set<string>((dictionary["passwords-common"] as string[]).map((p) => p.toLowerCase()));

/** True when the password, ignoring case and trailing digits/symbols, is on the common list. */
export function isCommonPassword(password: string): boolean {
  const lowered = password.toLowerCase();
  if (commonPasswords.has(lowered)) return true;
  const stem = lowered.replace(/[\d!@#$%^&*._-]+$/, "");
  return stem.length >= 4 && commonPasswords.has(stem) && stem.length >= lowered.length - 4;
}

export function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(password, cost);
}

export function passwordMatches(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

/** A hash to compare against when the account does not exist, so both paths take the same time. */
let decoyHash: string | null = null;
export async function decoyPasswordCheck(password: string, cost: number): Promise<false> {
  decoyHash ??= await bcrypt.hash("grainyard-decoy-password", cost);
  await bcrypt.compare(password, decoyHash);
  return false;
}
