// GET /feeds/notices.atom: an Atom feed (RFC 4287) of publications, amendments, cancellations,
// supersessions and expiries, newest first. Each change is its own entry.
import { Feed } from "feed";
import type { Route } from "./+types/feeds.notices.atom";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { getDefaultHarbour } from "~/models/harbour.server";
import { listPublicEvents } from "~/models/notice.server";
import { cachedResponse } from "~/services/http-cache.server";

const ACTION_WORDS: Record<string, string> = {
  published: "Published",
  amended: "Amended",
  cancelled: "Cancelled",
  superseded: "Superseded",
  expired: "Expired",
};

export async function loader({ request }: Route.LoaderArgs) {
  const origin = new URL(request.url).origin;
  const [harbour, events] = await Promise.all([getDefaultHarbour(), listPublicEvents(50)]);
  const host = new URL(origin).hostname;
  const feed = new Feed({
    id: `${origin}/feeds/notices.atom`,
    title: `${harbour?.authorityName ?? "Tidewire"}: local navigational warnings`,
    description: "Publications, amendments and cancellations of local navigational warnings. Tidewire informs; it does not replace official charts or notices.",
    link: `${origin}/notices`,
    language: "en",
    updated: events[0] ? new Date(events[0].at) : new Date(0),
    generator: "Tidewire",
    feedLinks: { atom: `${origin}/feeds/notices.atom` },
    copyright: harbour?.authorityName ?? "Tidewire",
  });
  for (const e of events) {
    const n = e.notice;
    const label = n.seriesNumber ?? `Notice ${n.id}`;
    const urgent = n.urgency === "urgent" ? "URGENT " : "";
    const reason = e.reason ? ` Reason: ${e.reason}` : "";
    feed.addItem({
      // tag: URI (RFC 4151), unique per notice and change.
      id: `tag:${host},2026:notice-${n.id}-audit-${e.auditId}`,
      title: `${urgent}${ACTION_WORDS[e.action] ?? e.action}: ${label} ${n.title}`,
      link: `${origin}/notices/${n.id}`,
      date: new Date(e.at),
      published: n.publishedAt ? new Date(n.publishedAt) : undefined,
      description: `${ACTION_WORDS[e.action] ?? e.action} ${label}.${reason}`,
      content: `<pre>${escapeHtml(renderBroadcast(n))}</pre>`,
      category: [{ term: e.action }, { term: n.generalType }],
    });
  }
  return cachedResponse(request, feed.atom1(), {
    contentType: "application/atom+xml; charset=utf-8",
    lastModified: events[0] ? new Date(events[0].at) : null,
    maxAgeS: 60,
  });
}

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}
