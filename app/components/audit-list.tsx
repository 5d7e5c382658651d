import { Link } from "react-router";
import { auditChanges, describeAudit } from "~/utils/audit-words";
import { formatDateTime, isoDateTime } from "~/utils/format";

/** One audit row as the list shows it (the shape `listAudit` gives, dates possibly as strings after the wire). */
export type AuditListRow = {
  id: number;
  at: Date | string;
  action: string;
  subjectType: string;
  reason: string | null;
  data: Record<string, unknown> | null;
  actor: { id: number; name: string } | null;
  guide: { id: number; title: string; slug: string } | null;
  subjectName: string | null;
  revisionNumber: number | null;
};

/**
 * Who did what, when and why: the site's audit log and a guide's own history. `showGuide` names
 * the guide on each row (the site log); a guide's history leaves it out.
 */
export function AuditList({
  entries,
  showGuide = true,
  empty = "Nothing has been recorded yet.",
}: {
  entries: AuditListRow[];
  showGuide?: boolean;
  empty?: string;
}) {
  if (entries.length === 0) return <p className="text-sm text-ink-soft">{empty}</p>;
  return (
    <ol className="divide-y divide-rule rounded-xl border border-rule bg-white">
      {entries.map((entry) => {
        const changes = auditChanges(entry.data);
        return (
          <li key={entry.id} className="px-4 py-3 text-sm">
            <p className="flex flex-wrap items-baseline gap-x-2">
              <span className="font-semibold">{entry.actor?.name ?? "Torqueleaf (no person)"}</span>
              <time dateTime={isoDateTime(entry.at)} className="whitespace-nowrap text-ink-soft">
                {formatDateTime(entry.at)}
              </time>
            </p>
            <p className="mt-1 break-words">{describeAudit(entry)}</p>
            {showGuide && entry.guide ? (
              <p className="mt-1 break-words text-ink-soft">
                Guide:{" "}
                <Link to={`/workbench/guides/${entry.guide.id}`} className="font-medium text-spruce-800 underline">
                  {entry.guide.title}
                </Link>
              </p>
            ) : null}
            {entry.reason ? (
              <p className="mt-1 break-words border-l-2 border-brass-500 pl-2 text-ink">
                {/* A submission's note is the author's change summary; every other note says why. */}
                <span className="text-ink-soft">{entry.action === "revision.submit" ? "What changed: " : "Why: "}</span>
                {entry.reason}
              </p>
            ) : null}
            {changes.length ? (
              <ul className="mt-1 list-inside list-disc text-ink-soft">
                {changes.map((c) => (
                  <li key={c} className="break-words">
                    {c}
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}

/** A guide's own history, collapsed: for its author and the editors on the guide's pages. */
export function GuideHistory({ entries }: { entries: AuditListRow[] }) {
  return (
    <details className="group rounded-xl border border-rule bg-white shadow-sm">
      <summary className="flex min-h-11 cursor-pointer items-center justify-between gap-2 px-4 py-2 font-semibold text-spruce-900">
        <span>History</span>
        <span className="text-sm font-normal text-ink-soft">{`${entries.length} ${entries.length === 1 ? "entry" : "entries"}`}</span>
      </summary>
      <div className="border-t border-rule p-3">
        <AuditList entries={entries} showGuide={false} empty="Nothing recorded for this guide yet." />
      </div>
    </details>
  );
}
