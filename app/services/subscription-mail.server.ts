// Subscription mail: confirmation, urgent alerts and digests, in plain text and HTML (inline
// styles only, via app/lib/mail-layout.ts), with RFC 8058 one-click unsubscribe headers.
import { env } from "~/env.server";
import { formatPosition } from "~/lib/geo/positions";
import { escapeHtml, mailLayout } from "~/lib/mail-layout";
import { generalTypeLabel } from "~/lib/notices/vocabulary";
import { describeArea } from "~/lib/subscriptions/area";
import { CHANGE_LABELS, groupDigest, positionLines, type DigestItem } from "~/lib/subscriptions/digest";
import { describeSchedule } from "~/lib/subscriptions/schedule";
import { signToken, type TokenPurpose } from "~/lib/subscriptions/tokens";
import type { ChangeKind } from "~/lib/subscriptions/digest";
import type { HarbourForMail, NoticeForMail, Subscription } from "~/models/subscription.server";
import { absoluteUrl } from "./mail.server";

export type MailParts = { subject: string; text: string; html: string; headers: Record<string, string> };

export function subscriptionToken(purpose: TokenPurpose, subscriptionId: number, nowMs = Date.now()): string {
  return signToken(env().SESSION_SECRET, purpose, subscriptionId, nowMs);
}

export function linkWithToken(path: string, purpose: TokenPurpose, subscriptionId: number): string {
  return absoluteUrl(`${path}?token=${encodeURIComponent(subscriptionToken(purpose, subscriptionId))}`);
}

function mailtoAddress(): string {
  const m = /@([A-Za-z0-9.-]+)/.exec(env().MAIL_FROM);
  return `unsubscribe@${m ? m[1] : "tidewire.invalid"}`;
}

/** RFC 2369 List-Unsubscribe with an https URL and a mailto, and RFC 8058 one-click POST. */
export function unsubscribeHeaders(subscriptionId: number, unsubscribeUrl?: string): Record<string, string> {
  const url = unsubscribeUrl ?? linkWithToken("/unsubscribe", "unsubscribe", subscriptionId);
  const mailto = `mailto:${mailtoAddress()}?subject=${encodeURIComponent(`unsubscribe ${subscriptionId}`)}`;
  return {
    "List-Unsubscribe": `<${url}>, <${mailto}>`,
    "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
    "List-Id": "Kestrel Sound notices <notices.tidewire.invalid>",
  };
}

const button = (url: string, label: string) =>
  `<a href="${escapeHtml(url)}" style="display:inline-block;background:#0b4f6c;color:#ffffff;padding:10px 16px;border-radius:6px;text-decoration:none;font-weight:600">${escapeHtml(label)}</a>`;

function footer(sub: Subscription, harbour: HarbourForMail) {
  const manage = linkWithToken("/subscriptions/manage", "manage", sub.id);
  const unsub = linkWithToken("/unsubscribe", "unsubscribe", sub.id);
  const why = `You receive this because ${sub.email} subscribed to notices for ${describeArea(sub.area, harbour.name)}.`;
  return {
    unsubscribeUrl: unsub,
    text: `${why}\nChange your subscription: ${manage}\nUnsubscribe: ${unsub}\n\nTidewire informs; it does not replace official charts, official notices to mariners or a proper lookout.`,
    html: `<br><br>${escapeHtml(why)}<br><a href="${escapeHtml(manage)}" style="color:#0b4f6c">Change your subscription</a> · <a href="${escapeHtml(unsub)}" style="color:#0b4f6c">Unsubscribe</a>`,
  };
}

export function confirmationMail(sub: Subscription, harbour: HarbourForMail): MailParts {
  const url = linkWithToken("/subscribe/confirm", "confirm", sub.id);
  const what = `${sub.urgentAlerts ? "urgent alerts" : "no urgent alerts"} and ${describeSchedule(sub.digest, harbour.timeZone)}`;
  const intro = `Please confirm that you want notices from ${harbour.authorityName} for ${describeArea(sub.area, harbour.name)}: ${what}.`;
  const outro = "The link expires in 72 hours. If you did not ask for this, ignore this message: nothing will be sent to you.";
  return {
    subject: `Confirm your ${harbour.name} notices subscription`,
    text: `${intro}\n\nConfirm: ${url}\n\n${outro}\n\n— Tidewire, ${harbour.authorityName}`,
    html: mailLayout(
      "Confirm your subscription",
      `<p style="margin:0 0 16px">${escapeHtml(intro)}</p><p style="margin:0 0 16px">${button(url, "Confirm subscription")}</p><p style="margin:0 0 16px;color:#4a5a66;font-size:14px">${escapeHtml(outro)}</p>`,
    ),
    headers: {},
  };
}

const ALERT_WORD: Record<Exclude<ChangeKind, "expired">, string> = { published: "URGENT", amended: "URGENT, AMENDED", cancelled: "CANCELLED" };

function fmtUtc(d: Date | null): string {
  if (!d) return "until further notice";
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

export function alertMail(sub: Subscription, harbour: HarbourForMail, notice: NoticeForMail, kind: Exclude<ChangeKind, "expired">): MailParts {
  const number = notice.seriesNumber ?? `notice ${notice.id}`;
  const url = absoluteUrl(`/notices/${notice.id}`);
  const positions = positionLines(notice.parts);
  const subject = `${ALERT_WORD[kind]}: ${number} ${notice.title}`;
  const lead =
    kind === "cancelled"
      ? `${number} has been cancelled${notice.cancellationReason ? `: ${notice.cancellationReason}` : "."}`
      : kind === "amended"
        ? `${number} has been amended. Read the notice again.`
        : `${harbour.authorityName} has published an urgent notice in your area.`;
  const f = footer(sub, harbour);
  const text = [
    lead,
    "",
    `${number} — ${notice.title}`,
    `Type: ${generalTypeLabel(notice.generalType)}`,
    `Locality: ${notice.locality}`,
    ...(positions.length ? ["Position(s) (WGS 84):", ...positions.map((p) => `  ${p}`)] : []),
    `In force from ${fmtUtc(notice.validFrom)} ${notice.validUntil ? `until ${fmtUtc(notice.validUntil)}` : "until further notice"}`,
    "",
    notice.body,
    "",
    `Read the notice: ${url}`,
    "",
    "— ",
    f.text,
  ].join("\n");
  const html = mailLayout(
    `${number} ${notice.title}`,
    `<p style="margin:0 0 12px"><span style="display:inline-block;background:${kind === "cancelled" ? "#4a5a66" : "#b3261e"};color:#ffffff;padding:2px 8px;border-radius:4px;font-size:13px;font-weight:700">${escapeHtml(ALERT_WORD[kind])}</span></p>
<p style="margin:0 0 12px">${escapeHtml(lead)}</p>
<table role="presentation" cellpadding="0" cellspacing="0" style="margin:0 0 12px;font-size:15px">
<tr><td style="padding:2px 12px 2px 0;color:#4a5a66">Type</td><td>${escapeHtml(generalTypeLabel(notice.generalType))}</td></tr>
<tr><td style="padding:2px 12px 2px 0;color:#4a5a66">Locality</td><td>${escapeHtml(notice.locality)}</td></tr>
${positions.length ? `<tr><td style="padding:2px 12px 2px 0;color:#4a5a66;vertical-align:top">Position (WGS 84)</td><td style="font-family:Consolas,Menlo,monospace">${positions.map(escapeHtml).join("<br>")}</td></tr>` : ""}
<tr><td style="padding:2px 12px 2px 0;color:#4a5a66">In force</td><td>from ${escapeHtml(fmtUtc(notice.validFrom))} ${escapeHtml(notice.validUntil ? `until ${fmtUtc(notice.validUntil)}` : "until further notice")}</td></tr>
</table>
<p style="margin:0 0 16px;white-space:pre-wrap">${escapeHtml(notice.body)}</p>
<p style="margin:0 0 8px">${button(url, "Read the notice")}</p>`,
    f.html,
  );
  return { subject, text, html, headers: unsubscribeHeaders(sub.id, f.unsubscribeUrl) };
}

/** Rendered text and HTML of one digest line, reusable across every digest of a batch. */
export type DigestFragments = Map<string, { text: string; html: string }>;

function digestLine(it: DigestItem): { text: string; html: string } {
  const n = it.notice;
  const url = absoluteUrl(`/notices/${n.id}`);
  const number = n.seriesNumber ?? `Notice ${n.id}`;
  const text = [`* [${CHANGE_LABELS[it.change]}]${n.urgency === "urgent" ? " [URGENT]" : ""} ${number} ${n.title}`, ...it.positions.map((p) => `    ${p}`), `    ${url}`].join("\n");
  // Compact markup: a digest may list hundreds of notices, and every byte is stored, sent and parsed.
  const html = `<p style="margin:0 0 10px"><b style="color:${it.change === "new" ? "#0b4f6c" : it.change === "amended" ? "#8a5a00" : "#4a5a66"}">${CHANGE_LABELS[it.change].toUpperCase()}</b>${n.urgency === "urgent" ? ' <b style="color:#b3261e">URGENT</b>' : ""} <a href="${escapeHtml(url)}" style="color:#0f2530">${escapeHtml(number)} ${escapeHtml(n.title)}</a>${it.positions.length ? `<br><span style="color:#4a5a66">${it.positions.map(escapeHtml).join("<br>")}</span>` : ""}</p>`;
  return { text, html };
}

export function digestMail(sub: Subscription, harbour: HarbourForMail, items: DigestItem[], window: { from: Date; to: Date }, fragments: DigestFragments = new Map()): MailParts {
  const groups = groupDigest(items);
  const cadence = sub.digest.cadence === "weekly" ? "Weekly" : "Daily";
  const subject = `${cadence} digest: ${items.length} change${items.length === 1 ? "" : "s"} to ${harbour.name} notices`;
  const intro = `Changes to notices in your area from ${fmtUtc(window.from)} to ${fmtUtc(window.to)}.`;
  const textLines: string[] = [intro, ""];
  let html = `<p style="margin:0 0 16px">${escapeHtml(intro)}</p>`;
  for (const g of groups) {
    textLines.push(g.label.toUpperCase());
    html += `<h2 style="margin:20px 0 8px;font-size:17px;color:#0b4f6c;border-bottom:1px solid #d5e0e5;padding-bottom:4px">${escapeHtml(g.label)}</h2>`;
    for (const it of g.items) {
      const key = `${it.notice.id}:${it.change}`;
      let line = fragments.get(key);
      if (!line) {
        line = digestLine(it);
        fragments.set(key, line);
      }
      textLines.push(line.text);
      html += line.html;
    }
    textLines.push("");
  }
  const f = footer(sub, harbour);
  textLines.push("— ", f.text);
  return { subject, text: textLines.join("\n"), html: mailLayout(`${cadence} digest`, html, f.html), headers: unsubscribeHeaders(sub.id, f.unsubscribeUrl) };
}

/** Position of a circle's centre for pages (re-exported for the routes). */
export const ddm = (lat: number, lon: number) => formatPosition(lat, lon, "ddm", { decimals: 2 });
