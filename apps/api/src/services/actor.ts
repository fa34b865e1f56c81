import type { Role } from "@grainyard/contracts";
import { Forbidden, Unauthorized } from "../errors.ts";

/** Who is acting. Every service function takes one, so permission cannot be forgotten by a route. */
export type Actor =
  | { kind: "anonymous" }
  | {
      kind: "account";
      accountId: string;
      role: Role;
      emailVerified: boolean;
      sessionKeyHash: string;
      /** An admin without a second factor: refused everything but its set-up until it is on. */
      secondFactorSetUpNeeded?: true;
    };

export type SignedInActor = Extract<Actor, { kind: "account" }>;

export function requireSignedIn(actor: Actor): SignedInActor {
  if (actor.kind !== "account") throw new Unauthorized();
  return actor;
}

export function requireRole(actor: Actor, ...roles: Role[]): SignedInActor {
  const signedIn = requireSignedIn(actor);
  if (!roles.includes(signedIn.role)) throw new Forbidden(`This needs a ${roles.join(" or ")} account.`);
  if (signedIn.secondFactorSetUpNeeded) throw secondFactorSetUpFirst();
  return signedIn;
}

/** What an admin without a second factor is told by everything but its set-up. */
export function secondFactorSetUpFirst(): Forbidden {
  return new Forbidden(
    "Set up a second factor first: admins use Grainyard only with a code from an authenticator app.",
    "second_factor_setup_required",
  );
}
