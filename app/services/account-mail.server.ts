import type { Db } from "~/db.server";
import { enqueueMail } from "~/models/outbox.server";
import { absoluteUrl } from "./mail.server";
import { escapeHtml, mailLayout } from "~/lib/mail-layout";

type Recipient = { id: number; email: string; name: string };

function message(title: string, intro: string, actionLabel: string, url: string, outro: string) {
  const text = `${intro}\n\n${actionLabel}: ${url}\n\n${outro}\n\n— Tidewire, Kestrel Sound Harbour Authority`;
  const html = mailLayout(
    title,
    `<p style="margin:0 0 16px">${escapeHtml(intro)}</p>
     <p style="margin:0 0 16px"><a href="${escapeHtml(url)}" style="display:inline-block;background:#0b4f6c;color:#ffffff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:600">${escapeHtml(actionLabel)}</a></p>
     <p style="margin:0 0 16px;color:#4a5a66;font-size:14px">${escapeHtml(outro)}</p>`,
  );
  return { text, html };
}

export async function queueVerificationMail(user: Recipient, token: string, db: Db) {
  const url = absoluteUrl(`/verify-email?token=${encodeURIComponent(token)}`);
  const body = message(
    "Confirm your e-mail address",
    `Hello ${user.name}, confirm your e-mail address to finish creating your Tidewire account.`,
    "Confirm e-mail address",
    url,
    "The link works once and expires in 48 hours. If you did not sign up, ignore this message.",
  );
  await enqueueMail({ idempotencyKey: `verify:${user.id}:${token.slice(0, 16)}`, kind: "account", to: user.email, subject: "Confirm your e-mail address", ...body }, db);
}

export async function queuePasswordResetMail(user: Recipient, token: string, db: Db) {
  const url = absoluteUrl(`/reset-password?token=${encodeURIComponent(token)}`);
  const body = message(
    "Reset your password",
    `Hello ${user.name}, someone (hopefully you) asked to reset the password of your Tidewire account.`,
    "Choose a new password",
    url,
    "The link works once and expires in 1 hour. If you did not ask for this, ignore this message: your password stays as it is.",
  );
  await enqueueMail({ idempotencyKey: `reset:${user.id}:${token.slice(0, 16)}`, kind: "account", to: user.email, subject: "Reset your Tidewire password", ...body }, db);
}

export async function queueInviteMail(user: Recipient, roleLabel: string, token: string, db: Db) {
  const url = absoluteUrl(`/accept-invite?token=${encodeURIComponent(token)}`);
  const body = message(
    "You are invited to Tidewire",
    `Hello ${user.name}, you have been invited to Tidewire as ${roleLabel} of the Kestrel Sound Harbour Authority.`,
    "Set your password",
    url,
    "The link works once and expires in 48 hours.",
  );
  await enqueueMail({ idempotencyKey: `invite:${user.id}:${token.slice(0, 16)}`, kind: "account", to: user.email, subject: "Your Tidewire staff account", ...body }, db);
}
