import { Form, Link, redirect } from "react-router";
import { z } from "zod";
import { Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { acceptContributorTerms } from "~/models/users.server";
import { requireUser } from "~/services/auth/guards.server";
import { getUser } from "~/services/auth/session.server";
import { AppError, invalid } from "~/utils/errors";
import { failureOf } from "~/utils/forms";
import { formatDate } from "~/utils/format";
import { handleForm } from "~/utils/forms.server";
import type { Route } from "./+types/contributor-terms";

export const meta: Route.MetaFunction = () => [
  { title: "Contributor terms · Torqueleaf" },
  { name: "description", content: "What you agree to when you write install guides for Torqueleaf." },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await getUser(args);
  const welcome = new URL(args.request.url).searchParams.has("welcome");
  return { signedIn: !!user, role: user?.role ?? null, acceptedAt: user?.termsAcceptedAt ?? null, welcome };
}

/** A reader who ticks the box becomes an author; editors and admins are appointed, never self-made. */
const termsForm = z.object({ agree: z.string().max(10).optional() });

export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  return handleForm(args.request, termsForm, async (input) => {
    if (user.role !== "reader") {
      throw new AppError(409, "wrong-state", "You already write for Torqueleaf; there is nothing more to accept.");
    }
    if (input.agree !== "yes") throw invalid({ agree: "Tick the box to accept the terms." });
    await acceptContributorTerms(await getDb(), user.id);
    return redirect("/contributor-terms?welcome=1");
  });
}

const TERMS = [
  [
    "Write from your own work.",
    "Describe installs you did or supervised. Photos must be yours, or used with the owner's permission, and must not show number plates or people who did not agree.",
  ],
  [
    "Give the numbers their source.",
    "Torque values come from the vehicle maker's manual or the part maker's sheet; say which. When you estimate, say that you estimate.",
  ],
  [
    "Respect the review.",
    "An editor checks every revision before it goes public and may ask for changes, add cautions or decline to publish. Nothing you write goes live without that.",
  ],
  [
    "Keep people safe.",
    "Mark every step that lifts the vehicle, disconnects the battery or touches high-voltage or airbag parts. When in doubt, add a caution.",
  ],
  [
    "No advertising.",
    "Name parts so readers can find them; do not write on behalf of a seller without saying so at the top of the guide.",
  ],
  [
    "Licence.",
    "You keep the copyright in what you write. You allow Torqueleaf to publish, adapt for layout and keep showing it, also after you leave.",
  ],
];

export default function ContributorTerms({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  return (
    <div className="mx-auto max-w-3xl px-6 py-10">
      <h1 className="font-serif text-4xl font-semibold tracking-tight text-spruce-900">Contributor terms</h1>
      <p className="mt-3 text-lg text-ink-soft">
        Readers become authors by accepting these terms. They are short on purpose: each one protects the people who will follow
        your guide in their own driveway.
      </p>
      <ol className="mt-8 space-y-4">
        {TERMS.map(([title, body], i) => (
          <li key={title} className="rounded-xl border border-rule bg-white p-5 shadow-sm">
            <h2 className="font-serif text-xl font-semibold text-spruce-900">
              {i + 1}. {title}
            </h2>
            <p className="mt-1 text-ink-soft">{body}</p>
          </li>
        ))}
      </ol>
      <div className="mt-8">
        {!loaderData.signedIn ? (
          <p>
            <Link to="/login?redirectTo=%2Fcontributor-terms" className="font-semibold text-spruce-700 underline">
              Sign in
            </Link>{" "}
            to accept the terms and start writing.
          </p>
        ) : loaderData.role === "reader" ? (
          <Form method="post" className="rounded-xl border border-rule bg-white p-5 shadow-sm">
            {failure ? <Notice tone="error">{failure.fields?.agree ?? failure.message}</Notice> : null}
            <label className="flex items-start gap-3">
              <input
                type="checkbox"
                name="agree"
                value="yes"
                className="mt-1 accent-spruce-700"
                aria-invalid={failure?.fields?.agree ? true : undefined}
              />
              <span>I have read the contributor terms and accept them.</span>
            </label>
            <div className="mt-4">
              <SubmitButton>Accept and become an author</SubmitButton>
            </div>
          </Form>
        ) : (
          <Notice tone="success">
            {loaderData.welcome ? "Welcome aboard: you are now an author. " : ""}
            You accepted these terms
            {loaderData.acceptedAt ? ` on ${formatDate(loaderData.acceptedAt)}` : ""}.
          </Notice>
        )}
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
