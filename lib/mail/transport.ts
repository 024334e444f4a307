import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

/** nodemailer over SMTP with the settings from the environment (SMTP_HOST, SMTP_PORT, …). */
export function smtpTransport(overrides: { host?: string; port?: number } = {}): Transporter {
  const e = env();
  return nodemailer.createTransport({
    host: overrides.host ?? e.SMTP_HOST,
    port: overrides.port ?? e.SMTP_PORT,
    secure: e.SMTP_SECURE === "true",
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? "" } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
}
