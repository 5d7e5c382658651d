import { env, standIns } from "~/utils/env.server";
import type { Route } from "./+types/dev.inbox";
import type { CaughtMail } from "~/services/fakes/mail";
import { formatDateTime, isoDateTime } from "~/utils/format";

/**
 * The local SMTP catcher's messages; exists only while the catcher stands in for mail (LOCAL_FAKES=1
 * and SMTP_HOST on this machine). `?format=json` for scripts and tests.
 */
export async function loader({ request }: Route.LoaderArgs) {
  const settings = env();
  if (!standIns(settings).mail) throw new Response("Not found", { status: 404 });
  const response = await fetch(`${settings.MAIL_INBOX_URL}/messages`);
  const { messages } = (await response.json()) as { messages: CaughtMail[] };
  if (new URL(request.url).searchParams.get("format") === "json") return Response.json({ messages });
  return { messages };
}

export const meta: Route.MetaFunction = () => [
  { title: "Development inbox · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

export default function DevInbox({ loaderData }: Route.ComponentProps) {
  const { messages } = loaderData as { messages: CaughtMail[] };
  return (
    <section className="mx-auto max-w-4xl px-6 py-10">
      <h1 className="font-serif text-3xl font-semibold text-spruce-900">Development inbox</h1>
      <p className="mt-2 text-ink-soft">
        Mail sent by this local instance is caught here and never leaves the machine. Newest first.
      </p>
      {messages.length === 0 ? (
        <p className="mt-8 rounded-lg border border-dashed border-rule p-8 text-center text-ink-soft">No mail yet.</p>
      ) : (
        <ol className="mt-6 space-y-4">
          {messages.map((m) => (
            <li key={m.id} className="rounded-lg border border-rule bg-white p-5 shadow-sm">
              <p className="text-sm text-ink-soft">
                To {m.to.join(", ")} · <time dateTime={isoDateTime(m.receivedAt)}>{formatDateTime(m.receivedAt)}</time>
              </p>
              <h2 className="mt-1 text-lg font-semibold">{m.subject}</h2>
              <pre className="mt-3 whitespace-pre-wrap break-words font-sans text-sm">{m.text}</pre>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
