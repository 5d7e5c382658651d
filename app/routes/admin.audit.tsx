import { data, Form, Link } from "react-router";
import { AuditList } from "~/components/audit-list";
import { Notice, SubmitButton } from "~/components/form";
import { Pager } from "~/components/pager";
import { getDb } from "~/db/client.server";
import { auditFilterChoices, auditParams, auditQuerySchema, listAudit } from "~/models/audit.server";
import { requirePermission } from "~/services/auth/guards.server";
import { AUDIT_ACTION_LABELS } from "~/utils/audit-words";
import { fieldErrors } from "~/utils/validation";
import type { Route } from "./+types/admin.audit";

export const meta: Route.MetaFunction = () => [
  { title: "Audit log · Admin · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

/**
 * The site's audit log, filtered by the address (`actor`, `action`, `guide`, `from`, `to`, `page`;
 * api.md), so a filtered view can be bookmarked and works without JavaScript. A filter that does
 * not parse answers 400 with the page and a message naming it, the typed values kept.
 */
export async function loader(args: Route.LoaderArgs) {
  await requirePermission(args, "read:audit");
  const typed = auditParams(new URL(args.request.url).searchParams);
  const db = await getDb();
  const choices = await auditFilterChoices(db);
  const parsed = auditQuerySchema.safeParse(typed);
  if (!parsed.success) {
    const fields = fieldErrors(parsed.error);
    return data({ entries: [], total: 0, page: 1, pageSize: 1, typed, choices, fields }, { status: 400 });
  }
  const result = await listAudit(db, parsed.data);
  return { ...result, typed, choices, fields: null as Record<string, string> | null };
}

const input = "mt-1 min-h-11 w-full rounded-md border bg-paper px-3 py-2 text-sm";
const FIELD_LABELS: Record<string, string> = {
  actor: "Who",
  action: "What",
  guide: "Guide",
  from: "From",
  to: "To",
  page: "Page",
};

export default function AdminAudit({ loaderData }: Route.ComponentProps) {
  const { entries, total, page, pageSize, typed, choices, fields } = loaderData;
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const pageLink = (n: number) => {
    const params = new URLSearchParams(typed);
    params.set("page", String(n));
    return `?${params}`;
  };
  const border = (name: string) => (fields?.[name] ? "border-z-danger" : "border-rule");
  const filtered = ["actor", "action", "guide", "from", "to"].some((k) => typed[k]);
  const actionOptions = Object.entries(AUDIT_ACTION_LABELS);
  if (typed.action && !(typed.action in AUDIT_ACTION_LABELS)) actionOptions.push([typed.action, typed.action]);

  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">Audit log</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Every change of state, review decision, sign-off, role change and catalogue edit, with who made it, when and why. Newest
        first; times in UTC.
      </p>

      <Form method="get" aria-label="Filter the audit log" className="mt-6 grid gap-3 sm:grid-cols-2 lg:grid-cols-6 lg:items-end">
        <label className="text-sm lg:col-span-1">
          <span className="block font-semibold">Who</span>
          <select name="actor" defaultValue={typed.actor ?? ""} className={`${input} ${border("actor")}`}>
            <option value="">Anyone</option>
            {choices.actors.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm lg:col-span-1">
          <span className="block font-semibold">What</span>
          <select name="action" defaultValue={typed.action ?? ""} className={`${input} ${border("action")}`}>
            <option value="">Any action</option>
            {actionOptions.map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm lg:col-span-2">
          <span className="block font-semibold">Guide</span>
          <select name="guide" defaultValue={typed.guide ?? ""} className={`${input} ${border("guide")}`}>
            <option value="">Any guide, or none</option>
            {choices.guides.map((g) => (
              <option key={g.id} value={g.id}>
                {g.title}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-semibold">From (UTC day)</span>
          <input name="from" type="date" defaultValue={typed.from ?? ""} className={`${input} ${border("from")}`} />
        </label>
        <label className="text-sm">
          <span className="block font-semibold">To (UTC day)</span>
          <input name="to" type="date" defaultValue={typed.to ?? ""} className={`${input} ${border("to")}`} />
        </label>
        <div className="flex flex-wrap items-center gap-3 sm:col-span-2 lg:col-span-6">
          <SubmitButton tone="quiet">Show</SubmitButton>
          {filtered ? (
            <Link to="/admin/audit" className="inline-flex min-h-11 items-center text-sm font-medium text-spruce-800 underline">
              Clear the filters
            </Link>
          ) : null}
        </div>
      </Form>

      <div className="mt-6">
        {fields ? (
          <Notice tone="error">
            <p className="font-semibold">These filters could not be used:</p>
            <ul className="mt-1 list-inside list-disc">
              {Object.entries(fields).map(([name, message]) => (
                <li key={name}>
                  {message.startsWith(`${FIELD_LABELS[name] ?? name}:`) ? message : `${FIELD_LABELS[name] ?? name}: ${message}`}
                </li>
              ))}
            </ul>
          </Notice>
        ) : (
          <p className="mb-3 text-sm text-ink-soft" role="status">
            {`${total} ${total === 1 ? "entry" : "entries"}${filtered ? " match" : ""}`}
          </p>
        )}
      </div>
      {fields ? null : <AuditList entries={entries} empty="No entries match these filters." />}
      <Pager page={page} pages={pages} href={pageLink} className="mt-4" />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
