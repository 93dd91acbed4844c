import type { LeadStatus } from "~/db/enums";
import { STATUS_LABEL } from "~/lib/lead-status";

const TONE: Record<LeadStatus, string> = {
  new: "bg-ember-100 text-ember-700",
  contacted: "bg-ash-200 text-char-700",
  "consult-booked": "bg-ember-50 text-ember-700 ring-1 ring-ember-200",
  "proposal-sent": "bg-char-700 text-ash-50",
  won: "bg-moss-100 text-moss-700",
  lost: "bg-ash-100 text-char-500",
};

/** A lead's status as a small pill. */
export function LeadStatusBadge({ status }: { status: LeadStatus }) {
  return (
    <span className={`inline-block rounded-full px-2.5 py-0.5 text-xs font-extrabold whitespace-nowrap ${TONE[status]}`}>
      {STATUS_LABEL[status]}
    </span>
  );
}
