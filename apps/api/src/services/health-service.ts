import type { DataSource } from "typeorm";
import type { Health } from "@grainyard/contracts";
import type { Mailer } from "../integrations/mail.ts";
import type { PaymentsPort } from "../integrations/payments.ts";
import type { PhotoStorage } from "../integrations/storage.ts";

export interface HealthService {
  /** Each part of the stack as up or down; "degraded" when any part is down. */
  check(): Promise<Health>;
}

export function createHealthService(deps: {
  dataSource: DataSource;
  storage: PhotoStorage;
  mailer: Mailer;
  payments: Pick<PaymentsPort, "isUp">;
}): HealthService {
  return {
    async check() {
      const database = deps.dataSource
        .query("SELECT 1")
        .then(() => true)
        .catch(() => false);
      const [db, storage, mail, payments] = await Promise.all([database, deps.storage.isUp(), deps.mailer.isUp(), deps.payments.isUp()]);
      const state = (up: boolean) => (up ? "up" : "down") as "up" | "down";
      const down = [
        [db, "the database"],
        [storage, "photo storage"],
        [mail, "outgoing mail (e-mails wait in the outbox)"],
        [payments, "card payments"],
      ].flatMap(([up, name]) => (up ? [] : [name as string]));
      return {
        status: down.length === 0 ? "ok" : "degraded",
        components: { database: state(db), storage: state(storage), mail: state(mail), payments: state(payments) },
        ...(down.length ? { message: `Down just now: ${down.join(", ")}.` } : {}),
      };
    },
  };
}
