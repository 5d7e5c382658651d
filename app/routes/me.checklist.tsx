import { Form, Link } from "react-router";
import { AddItemForm, ChecklistItemRow, Progress } from "~/components/checklist";
import { Notice, SubmitButton } from "~/components/form";
import { KeptWithGuide } from "~/components/keep-on-device";
import { getDb } from "~/db/client.server";
import { idParam } from "~/models/checklist-input";
import { getChecklist } from "~/models/checklists.server";
import { requireUser } from "~/services/auth/guards.server";
import { notFound } from "~/utils/errors";
import { failureOf } from "~/utils/forms";
import { formHeaders } from "~/utils/forms.server";
import { forPage } from "~/utils/http.server";
import { OFFLINE_ANSWER, revalidateUnlessOffline } from "~/utils/offline-answer";
import { itemChangeOf, sendItemChange, useQueuedItems, withQueued } from "~/utils/offline-checklist";
import { useRootData } from "~/utils/root-data";
import type { Route } from "./+types/me.checklist";
import { checklistAction } from "./me.checklist.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `Checklist: ${data.checklist.guide.title} · Torqueleaf` : "Checklist · Torqueleaf" },
  { name: "description", content: "Parts and tools for a guide, ticked off as you go." },
  { name: "robots", content: "noindex" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const checklist = await forPage(async () => {
    const id = idParam(args.params.id);
    if (id === null) throw notFound("This checklist");
    return getChecklist(await getDb(), user, id);
  });
  return { checklist, print: new URL(args.request.url).searchParams.get("print") === "1" };
}

export const action = (args: Route.ActionArgs) => checklistAction(args);

/**
 * Without signal, a tick or a quantity and note goes through the item API instead, which the service
 * worker queues: the row keeps it and says so. Any other change (or one with no worker to queue it)
 * is answered like a refusal, so it goes back and the row says why.
 */
export async function clientAction({ request, params, serverAction }: Route.ClientActionArgs) {
  const form = await request.clone().formData();
  try {
    return await serverAction();
  } catch (error) {
    if (!(error instanceof TypeError || !navigator.onLine)) throw error;
    const checklist = Number(params.id);
    const change = itemChangeOf(form);
    if (!change || !Number.isInteger(checklist)) return OFFLINE_ANSWER;
    return (await sendItemChange(checklist, change.itemId, change.change)) ?? OFFLINE_ANSWER;
  }
}

export const shouldRevalidate = revalidateUnlessOffline;

export const headers = formHeaders;

const link =
  "inline-flex min-h-11 items-center rounded-md border border-rule px-3 text-sm font-medium text-spruce-800 hover:bg-paper-deep";

export default function ChecklistPage({ loaderData, actionData }: Route.ComponentProps) {
  const { checklist: kept, print } = loaderData;
  const failure = failureOf(actionData);
  const reader = useRootData()?.user?.id ?? null;
  // Changes made without signal and still queued show over the state the page was loaded (or kept) with.
  const { queued, refresh } = useQueuedItems(reader, kept.id);
  const checklist = { ...kept, items: kept.items.map((item) => withQueued(item, queued.get(item.id))) };
  const current = checklist.items.filter((i) => !i.removed);
  const ticked = current.filter((i) => i.checked).length;
  const groups = [
    { title: "Parts", items: checklist.items.filter((i) => i.kind === "part") },
    { title: "Tools", items: checklist.items.filter((i) => i.kind === "tool") },
    { title: "Your own items", items: checklist.items.filter((i) => i.kind === "own") },
  ];
  if (print) return <PrintView checklist={checklist} />;
  return (
    <div className="mx-auto max-w-3xl px-4 py-8 sm:px-6 sm:py-10">
      <p className="text-sm print:hidden">
        <Link to="/me/checklists" className="inline-flex min-h-11 items-center text-spruce-700 underline">
          All checklists
        </Link>
      </p>
      <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900 sm:text-4xl">{checklist.guide.title}</h1>
      <p className="mt-1 text-ink-soft">
        Parts checklist from revision {checklist.revisionNumber} of{" "}
        <Link to={`/guides/${checklist.guide.slug}`} className="text-spruce-700 underline">
          the guide
        </Link>
      </p>
      <KeptWithGuide checklist={checklist.id} guideSlug={checklist.guide.slug} />
      <Progress checked={ticked} total={current.length} label="This checklist" />
      {failure ? (
        <div className="mt-4">
          <Notice tone="error" focusOn={actionData}>
            {failure.message} {Object.values(failure.fields ?? {}).join(" ")}
          </Notice>
        </div>
      ) : null}
      {checklist.newerRevision ? (
        <section className="mt-6 rounded-xl border-l-4 border-brass-500 bg-brass-50 p-4 print:hidden" aria-labelledby="newer">
          <h2 id="newer" className="font-semibold">
            A newer revision of the guide is published (revision {checklist.latestRevisionNumber})
          </h2>
          <p className="mt-1 text-sm">
            Merge its changes: parts it adds appear, parts it no longer lists are marked. Your ticks, quantities, notes and own
            items stay as they are.
          </p>
          <Form method="post" className="mt-3">
            <input type="hidden" name="intent" value="merge" />
            <SubmitButton>Merge the changes</SubmitButton>
          </Form>
        </section>
      ) : null}
      <div className="mt-6 flex flex-wrap gap-2 print:hidden">
        <Link to="?print=1" className={link}>
          Printable view
        </Link>
        <a href={`/me/checklists/${checklist.id}/csv`} className={link} download>
          Download CSV
        </a>
      </div>
      {groups.map((group) =>
        group.items.length || group.title === "Your own items" ? (
          <section key={group.title} className="mt-6 rounded-xl border border-rule bg-white px-4 py-2 shadow-sm sm:px-5">
            <h2 className="pt-2 font-serif text-lg font-semibold text-spruce-900">{group.title}</h2>
            <ul className="divide-y divide-rule/60">
              {group.items.map((item) => (
                <ChecklistItemRow key={item.id} item={item} queued={queued.has(item.id)} onQueued={refresh} />
              ))}
            </ul>
            {group.title === "Your own items" ? (
              <AddItemForm posted={failure?.values?.intent === "add" ? failure : null} />
            ) : null}
            <div className="h-2" />
          </section>
        ) : null,
      )}
      <Form method="post" className="mt-10 print:hidden">
        <input type="hidden" name="intent" value="delete" />
        <SubmitButton tone="danger">Delete this checklist</SubmitButton>
      </Form>
    </div>
  );
}

/** One table to print or keep on paper: an empty box to tick by hand, or a tick already made. */
function PrintView({ checklist }: { checklist: Route.ComponentProps["loaderData"]["checklist"] }) {
  return (
    <div className="mx-auto max-w-3xl px-4 py-6 sm:px-6">
      <div className="flex flex-wrap gap-2 print:hidden">
        <Link to={`/me/checklists/${checklist.id}`} className={link}>
          Back to the checklist
        </Link>
        <button type="button" className={link} onClick={() => window.print()}>
          Print
        </button>
      </div>
      <h1 className="mt-4 font-serif text-2xl font-semibold text-spruce-900">{checklist.guide.title}</h1>
      <p className="text-sm text-ink-soft">Parts checklist, revision {checklist.revisionNumber}</p>
      <table className="mt-4 w-full border-collapse text-sm">
        <thead>
          <tr className="border-b-2 border-ink text-left">
            <th scope="col" className="w-8 py-1">
              <span className="sr-only">Ticked</span>
            </th>
            <th scope="col" className="w-12 py-1 text-right">
              Qty
            </th>
            <th scope="col" className="py-1 pl-3">
              Item
            </th>
            <th scope="col" className="w-14 py-1">
              Step
            </th>
          </tr>
        </thead>
        <tbody>
          {checklist.items.map((item) => (
            <tr key={item.id} className="break-inside-avoid border-b border-rule align-top">
              <td className="py-1.5">
                <span className="grid size-5 place-items-center border-2 border-ink text-sm font-bold leading-none">
                  {item.checked ? "✓" : ""}
                  <span className="sr-only">{item.checked ? "ticked" : "not ticked"}</span>
                </span>
              </td>
              <td className="py-1.5 text-right font-mono tabular-nums">{item.quantity}</td>
              <td className="break-words py-1.5 pl-3">
                {item.name}
                {item.partNumber ? <span className="block font-mono text-xs">no. {item.partNumber}</span> : null}
                {item.removed ? <span className="block text-xs">No longer in the guide</span> : null}
                {item.note ? <span className="block text-xs italic">{item.note}</span> : null}
              </td>
              <td className="py-1.5">{item.step ?? ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
