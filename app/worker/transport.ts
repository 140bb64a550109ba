// The worker's own SMTP transport: pooled for speed, but thrown away after a connection-level
// failure (a pool that saw the relay vanish can be left with connections that never answer),
// and every send has a deadline, so one stuck message cannot stall the worker.
import nodemailer, { type SendMailOptions, type Transporter } from "nodemailer";
import { env } from "~/env.server";

export const SEND_TIMEOUT_MS = 30_000;
const CONNECTION_ERRORS = /ECONNREFUSED|ECONNRESET|ESOCKET|ETIMEDOUT|EPIPE|ECONNECTION|Connection closed|timeout/i;

let current: Transporter | undefined;

function create(): Transporter {
  const e = env();
  return nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? "" } : undefined,
    pool: true,
    maxConnections: Number(process.env.SMTP_MAX_CONNECTIONS ?? 4),
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 15000,
  });
}

export function workerTransport(): Transporter {
  current ??= create();
  return current;
}

export function resetWorkerTransport() {
  const old = current;
  current = undefined;
  old?.close();
}

/** Sends one message; rejects after SEND_TIMEOUT_MS; resets the pool on connection errors. */
export async function sendWithDeadline(message: SendMailOptions, transport?: Transporter): Promise<void> {
  const t = transport ?? workerTransport();
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      t.sendMail(message),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error(`SMTP send timed out after ${SEND_TIMEOUT_MS} ms`)), SEND_TIMEOUT_MS);
      }),
    ]);
  } catch (error) {
    const e = error as { code?: string; message?: string };
    if (!transport && CONNECTION_ERRORS.test(`${e.code ?? ""} ${e.message ?? ""}`) && current === t) resetWorkerTransport();
    throw error;
  } finally {
    clearTimeout(timer);
  }
}
