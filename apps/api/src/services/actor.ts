import type { Role } from "@grainyard/contracts";
import { Forbidden, Unauthorized } from "../errors.ts";

/** Who is acting. Every service function takes one, so permission cannot be forgotten by a route. */
export type Actor =
  { kind: "anonymous" } | { kind: "account"; accountId: string; role: Role; emailVerified: boolean; sessionKeyHash: string };

export type SignedInActor = Extract<Actor, { kind: "account" }>;

export function requireSignedIn(actor: Actor): SignedInActor {
  if (actor.kind !== "account") throw new Unauthorized();
  return actor;
}

export function requireRole(actor: Actor, ...roles: Role[]): SignedInActor {
  const signedIn = requireSignedIn(actor);
  if (!roles.includes(signedIn.role)) throw new Forbidden(`This needs a ${roles.join(" or ")} account.`);
  return signedIn;
}
