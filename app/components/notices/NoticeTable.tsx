import { Link } from "react-router";
import type { NoticeView } from "~/lib/notices/types";
import { generalTypeLabel } from "~/lib/notices/vocabulary";
import { formatLocal } from "./format";
import { NoticeBadges } from "./NoticeBadges";

type Col = { key: string; label: string; sortable?: boolean };

/** What a row of the table shows (pages may send just this much of each notice). */
export type NoticeRowData = Pick<NoticeView, "id" | "seriesNumber" | "title" | "locality" | "generalType" | "urgency" | "effectiveStatus" | "validFrom" | "validUntil"> & {
  /**
   * The dates already formatted in the harbour's zone by the loader: the browser then builds no
   * time-zone formatter while hydrating (the first one costs ~30 ms of CPU on a phone).
   */
  validFromText?: string;
  validUntilText?: string;
};

export function noticeRowData(n: NoticeView, zone?: string): NoticeRowData {
  return {
    ...(zone ? { validFromText: formatLocal(n.validFrom, zone), validUntilText: n.validUntil ? formatLocal(n.validUntil, zone) : undefined } : {}),
    id: n.id,
    seriesNumber: n.seriesNumber,
    title: n.title,
    locality: n.locality,
    generalType: n.generalType,
    urgency: n.urgency,
    effectiveStatus: n.effectiveStatus,
    validFrom: n.validFrom,
    validUntil: n.validUntil,
  };
}
const COLS: Col[] = [
  { key: "number", label: "Number", sortable: true },
  { key: "title", label: "Notice", sortable: true },
  { key: "type", label: "Type", sortable: true },
  { key: "urgency", label: "Urgency / status", sortable: true },
  { key: "validFrom", label: "In force from", sortable: true },
  { key: "validUntil", label: "Until", sortable: true },
];

/**
 * The notices table. With `sortHref`, column headers are sort links (server-side sorting via
 * search params, so it works without JavaScript).
 */
export function NoticeTable({
  notices,
  zone,
  sort,
  dir,
  sortHref,
  hrefFor = (n) => `/notices/${n.id}`,
  caption,
}: {
  notices: NoticeRowData[];
  zone: string;
  sort?: string;
  dir?: "asc" | "desc";
  sortHref?: (key: string, dir: "asc" | "desc") => string;
  hrefFor?: (n: NoticeRowData) => string;
  caption: string;
}) {
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full border-collapse bg-white text-sm" data-testid="notice-table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b-2 border-mist text-left">
            {COLS.map((c) => {
              const active = sort === c.key;
              const nextDir = active && dir === "asc" ? "desc" : "asc";
              return (
                <th key={c.key} scope="col" className="px-3 py-2" aria-sort={active ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                  {sortHref && c.sortable ? (
                    <Link to={sortHref(c.key, nextDir)} className="font-bold text-ink">
                      {c.label} {active ? (dir === "asc" ? "▲" : "▼") : ""}
                    </Link>
                  ) : (
                    c.label
                  )}
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {notices.length === 0 ? (
            <tr>
              <td colSpan={COLS.length} className="px-3 py-4 text-slate">
                No notices match.
              </td>
            </tr>
          ) : null}
          {notices.map((n) => (
            // Cell padding set once per row (`*:`): the board lists every notice in force, and
            // each repeated class is bytes in every copy of the page.
            <tr key={n.id} className={`border-b border-mist/70 align-top *:px-3 *:py-2 ${n.urgency === "urgent" && n.effectiveStatus === "in_force" ? "bg-signal-light" : ""}`} data-notice-id={n.id}>
              <td className="position font-semibold">{n.seriesNumber ?? "Draft"}</td>
              <td>
                <Link to={hrefFor(n)} className="font-semibold">
                  {n.title}
                </Link>
                <div className="line-clamp-2 max-w-xl text-slate">{n.locality}</div>
              </td>
              <td>{generalTypeLabel(n.generalType)}</td>
              <td>
                <NoticeBadges status={n.effectiveStatus} urgency={n.urgency} />
              </td>
              <td className="whitespace-nowrap">{n.validFromText ?? formatLocal(n.validFrom, zone)}</td>
              <td className="whitespace-nowrap">{n.validUntil ? (n.validUntilText ?? formatLocal(n.validUntil, zone)) : "Until further notice"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
