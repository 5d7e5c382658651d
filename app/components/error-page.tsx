import { isRouteErrorResponse, Link, useRouteError } from "react-router";

const COPY: Record<number, { title: string; body: string }> = {
  400: { title: "That request did not make sense", body: "Something in the address or the form was not what we expected." },
  401: { title: "Sign in to continue", body: "This page is for signed-in members." },
  403: { title: "Not available to you", body: "Your account does not have access to this page." },
  404: {
    title: "No guide or page here",
    body: "The address may be mistyped, or the guide may have been unpublished while its author revises it.",
  },
  405: { title: "Not something this address does", body: "This page can be opened, and its forms sent, but not that." },
  409: { title: "That changed a moment ago", body: "Someone else acted on this first. Reload the page to see where it stands." },
  410: {
    title: "This guide was taken out of the Library",
    body: "An editor unpublished it. Follow the vehicle maker's instructions until a reviewed revision is back.",
  },
  415: { title: "That form arrived in a shape we cannot read", body: "Send it again from the page itself." },
  500: { title: "Something went wrong on our side", body: "The error has been logged. Try again in a moment." },
};

/** The letters of a sentence, lower-case, so two wordings of one sentence compare alike. */
const letters = (text: string) => text.toLowerCase().replace(/[^a-z]/g, "");

/**
 * Whether a route's own message says what the page's sentence already says ("… access to this."
 * beside "… access to this page."): the page then shows the sentence once.
 */
export function repeatsBody(detail: string, body: string) {
  const a = letters(detail);
  const b = letters(body);
  return a.length > 0 && (a.startsWith(b) || b.startsWith(a));
}

/** The plain-words page every route's ErrorBoundary shows. */
export function ErrorPage({ status, detail }: { status: number; detail?: string }) {
  const copy = COPY[status] ?? COPY[500];
  const extra = detail && status < 500 && !repeatsBody(detail, copy.body) ? detail : null;
  return (
    <section className="mx-auto max-w-2xl px-6 py-20 text-center">
      <p className="font-mono text-sm tracking-widest text-brass-700">ERROR {status}</p>
      <h1 className="mt-3 font-serif text-4xl font-semibold text-spruce-900">{copy.title}</h1>
      <p className="mt-4 text-lg text-ink-soft">{copy.body}</p>
      {extra ? <p className="mt-2 text-ink-soft">{extra}</p> : null}
      <div className="mt-8 flex flex-wrap justify-center gap-3">
        <Link
          to="/"
          className="inline-flex min-h-11 items-center rounded-md bg-spruce-800 px-4 py-2 font-medium text-paper hover:bg-spruce-700"
        >
          Browse the library
        </Link>
        <Link
          to="/tools/circuit"
          className="inline-flex min-h-11 items-center rounded-md border border-rule px-4 py-2 font-medium text-spruce-800 hover:bg-paper-deep"
        >
          Open the circuit planner
        </Link>
      </div>
    </section>
  );
}

/** Every route's ErrorBoundary: a thrown response keeps its status, anything else is a 500. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  if (isRouteErrorResponse(error)) {
    return <ErrorPage status={error.status} detail={typeof error.data === "string" ? error.data : undefined} />;
  }
  return <ErrorPage status={500} />;
}
