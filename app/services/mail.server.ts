import nodemailer, { type Transporter } from "nodemailer";
import { env } from "~/env.server";

let transport: Transporter | undefined;

/** The SMTP relay from the environment (the local fake in development and tests). */
export function mailTransport(): Transporter {
  if (transport) return transport;
  const e = env();
  transport = nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? "" } : undefined,
    // A relay that offers STARTTLS is used with it; the local fake offers none.
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 15000,
    pool: true,
    maxConnections: 4,
  });
  return transport;
}

export function absoluteUrl(path: string): string {
  return new URL(path, env().APP_URL).toString();
}
