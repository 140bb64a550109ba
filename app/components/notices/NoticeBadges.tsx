import type { NoticeStatus } from "~/lib/notices/vocabulary";
import { STATUS_LABELS } from "~/lib/notices/vocabulary";

const STATUS_CLASSES: Record<NoticeStatus, string> = {
  draft: "bg-tide-light text-deep",
  in_force: "bg-kelp-light text-kelp",
  expired: "bg-mist text-slate",
  cancelled: "bg-danger-light text-danger",
  superseded: "bg-mist text-slate",
};

/** Status and urgency. Urgent is signalled by colour AND the word URGENT. */
export function NoticeBadges({ status, urgency }: { status: NoticeStatus; urgency: "urgent" | "routine" }) {
  return (
    <span className="inline-flex flex-wrap gap-1 align-middle">
      {urgency === "urgent" ? <span className="badge bg-signal text-white">⚠ Urgent</span> : null}
      <span className={`badge ${STATUS_CLASSES[status]}`} data-status={status}>
        {STATUS_LABELS[status]}
      </span>
    </span>
  );
}
