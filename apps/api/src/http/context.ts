import type { Request } from "express";
import type { ZodType } from "zod";
import { fieldMessages } from "@grainyard/contracts";
import { Invalid } from "../errors.ts";
import type { Actor } from "../services/actor.ts";
import type { PendingSecondStep } from "../services/account-service.ts";

/** What the session cookie holds: the anti-forgery token and, when signed in, the session key. */
export interface SessionCookie {
  csrf?: string;
  key?: string;
  /** Between a right password and the code of an account with a second factor (no session yet). */
  pending?: PendingSecondStep;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      actor: Actor;
    }
  }
}

export function sessionOf(req: Request): SessionCookie {
  return (req.session ?? {}) as SessionCookie;
}

/** Parses input with a shared zod schema; a failure becomes 422 with a message per field. */
export function parse<T>(schema: ZodType<T>, value: unknown): T {
  const result = schema.safeParse(value);
  if (!result.success) {
    const fields = fieldMessages(result.error);
    throw new Invalid("Some fields need another look.", fields);
  }
  return result.data;
}
