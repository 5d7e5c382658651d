import { Form, Link, redirect } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { peekToken } from "~/models/user-tokens.server";
import { confirmAddress } from "~/services/auth/accounts.server";
import { z } from "zod";
import { AppError } from "~/utils/errors";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import type { Route } from "./+types/verify";

export const meta: Route.MetaFunction = () => [
  { title: "Confirm your address · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

/**
 * Opening the link only shows a button: mail scanners open links too, and a single-use token
 * should be spent by the person, not by a scanner.
 */
export async function loader({ params }: Route.LoaderArgs) {
  const valid = !!(await peekToken(await getDb(), params.token, "verify-email"));
  return { valid };
}

export const headers = formHeaders;

export async function action({ request, params }: Route.ActionArgs) {
  return handleForm(request, z.object({}), async () => {
    if (await confirmAddress(request, params.token)) return redirect("/login?notice=verified");
    throw new AppError(400, "expired", "This confirmation link has expired or was used already.");
  });
}

export default function Verify({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  if (!loaderData.valid || failure) {
    return (
      <AuthCard title="This link no longer works">
        <Notice tone="error">{failure?.message ?? "This confirmation link has expired or was used already."}</Notice>
        <p className="text-ink-soft">
          If your address is already confirmed, just{" "}
          <Link to="/login" className="text-spruce-700 underline">
            sign in
          </Link>
          . Otherwise{" "}
          <Link to="/login#resend" className="text-spruce-700 underline">
            ask for a new link
          </Link>
          .
        </p>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Confirm your address" intro="One click to show that this e-mail address is yours.">
      <Form method="post">
        <SubmitButton>Confirm this address</SubmitButton>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
