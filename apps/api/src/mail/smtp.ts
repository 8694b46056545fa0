// Delivery through a real SMTP server when SMTP_HOST, SMTP_PORT, SMTP_USER, SMTP_PASS and
// SMTP_FROM are set; otherwise the outbox table is the only delivery (local mode).
import nodemailer from "nodemailer";
import type { Queryable } from "../db/client";
import { createOutboxMailer, type Mailer } from "./mailer";

export interface SmtpSettings {
  readonly host: string;
  readonly port: number;
  readonly user: string;
  readonly pass: string;
  /** The sender, e.g. "Tributary <no-reply@example.com>". */
  readonly from: string;
  /** TLS from the first byte (port 465); otherwise STARTTLS is used when the server offers it. */
  readonly secure: boolean;
}

const smtpVariables = ["SMTP_HOST", "SMTP_PORT", "SMTP_USER", "SMTP_PASS", "SMTP_FROM"] as const;

/** SMTP settings from the environment: all five variables, or none (then null). Throws a clear message on a partial or bad set. */
export function smtpSettingsFromEnv(env: NodeJS.ProcessEnv): SmtpSettings | null {
  const given = smtpVariables.filter((name) => (env[name] ?? "") !== "");
  if (given.length === 0) return null;
  const missing = smtpVariables.filter((name) => !given.includes(name));
  if (missing.length > 0) throw new Error(`To send e-mail through SMTP set all of ${smtpVariables.join(", ")}; missing: ${missing.join(", ")}`);
  const port = Number(env.SMTP_PORT);
  if (!Number.isInteger(port) || port < 1 || port > 65_535) throw new Error(`SMTP_PORT must be a port number, got "${env.SMTP_PORT}"`);
  const secureRaw = env.SMTP_SECURE ?? "";
  if (!["", "true", "false"].includes(secureRaw)) throw new Error(`SMTP_SECURE must be true or false, got "${secureRaw}"`);
  return {
    host: env.SMTP_HOST!,
    port,
    user: env.SMTP_USER!,
    pass: env.SMTP_PASS!,
    from: env.SMTP_FROM!,
    secure: secureRaw === "" ? port === 465 : secureRaw === "true",
  };
}

/** The nodemailer SMTP transport for the settings. */
export function smtpTransport(settings: SmtpSettings) {
  return nodemailer.createTransport({
    host: settings.host,
    port: settings.port,
    secure: settings.secure,
    auth: { user: settings.user, pass: settings.pass },
    connectionTimeout: 15_000,
    greetingTimeout: 15_000,
    socketTimeout: 30_000,
  });
}

/** The app's mailer: the outbox always, and SMTP delivery when configured. */
export function createMailer(db: Queryable, smtp: SmtpSettings | null): Mailer {
  return smtp ? createOutboxMailer(db, { transport: smtpTransport(smtp), from: smtp.from }) : createOutboxMailer(db);
}
