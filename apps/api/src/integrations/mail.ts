import nodemailer from "nodemailer";
import type { AppConfig } from "../config.ts";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** True when the SMTP server answers (used by /api/health). */
  isUp(): Promise<boolean>;
  close(): void;
}

/** Sends mail over real SMTP (the local mail sink in development and tests). */
export function createMailer(config: AppConfig["mail"]): Mailer {
  const transport = nodemailer.createTransport({
    host: config.host,
    port: config.port,
    secure: config.secure,
    ignoreTLS: !config.secure && (config.host === "127.0.0.1" || config.host === "localhost"),
    auth: config.user ? { user: config.user, pass: config.password ?? "" } : undefined,
    connectionTimeout: 5_000,
    greetingTimeout: 5_000,
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: config.from, ...mail });
    },
    async isUp() {
      try {
        return await transport.verify();
      } catch {
        return false;
      }
    },
    close: () => transport.close(),
  };
}
