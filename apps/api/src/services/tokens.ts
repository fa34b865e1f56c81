import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

/** A random, URL-safe token of 256 bits: unguessable, so it can stand in a mailed link. */
export function newToken(): string {
  return randomBytes(32).toString("base64url");
}

/** Only hashes of tokens and session keys are stored, so a database leak reveals no live link. */
export function tokenHash(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export function sameToken(a: string, b: string): boolean {
  const left = Buffer.from(a);
  const right = Buffer.from(b);
  return left.length === right.length && timingSafeEqual(left, right);
}
