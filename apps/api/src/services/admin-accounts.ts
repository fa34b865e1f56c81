import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import { emailSchema } from "@grainyard/contracts";
import { AccountEntity } from "../entities/index.ts";
import { recordAudit } from "./audit-log.ts";
import { hashPassword } from "./passwords.ts";

/**
 * Makes an admin. Called only from the operator's command line (never from an HTTP route), so
 * the acting user here is the person at the server's shell.
 */
export async function createAdmin(
  dataSource: DataSource,
  input: { email: string; displayName?: string; password: string; bcryptCost: number },
): Promise<{ email: string; created: boolean }> {
  const parsed = emailSchema.safeParse(input.email);
  if (!parsed.success) throw new Error(`"${input.email}" is not a valid e-mail address.`);
  const email = parsed.data;
  return dataSource.transaction(async (manager) => {
    const repository = manager.getRepository(AccountEntity);
    const existing = await repository.findOneBy({ email });
    if (existing) {
      await repository.update({ id: existing.id }, { role: "admin", yardName: null, pickupTown: null });
      await recordAudit(
        manager,
        "cli",
        {
          action: "account.promote",
          targetKind: "account",
          targetId: existing.id,
          before: { role: existing.role },
          after: { role: "admin" },
        },
        new Date(),
      );
      return { email, created: false };
    }
    const id = randomUUID();
    await recordAudit(
      manager,
      "cli",
      { action: "account.create_admin", targetKind: "account", targetId: id, before: null, after: { role: "admin", email } },
      new Date(),
    );
    await repository.insert({
      id,
      email,
      passwordHash: await hashPassword(input.password, input.bcryptCost),
      role: "admin",
      displayName: input.displayName ?? email.split("@")[0]!,
      yardName: null,
      pickupTown: null,
      emailVerifiedAt: new Date(),
    });
    return { email, created: true };
  });
}
