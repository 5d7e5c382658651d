import { Form, Link, redirect } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { Field, Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { peekToken } from "~/models/user-tokens.server";
import { completePasswordReset } from "~/services/auth/accounts.server";
import { newPasswordSchema, PASSWORD_MIN } from "~/services/auth/fields.server";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import type { Route } from "./+types/reset.token";

export const meta: Route.MetaFunction = () => [
  { title: "Choose a new password · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

export async function loader({ params }: Route.LoaderArgs) {
  const valid = !!(await peekToken(await getDb(), params.token, "reset-password"));
  return { valid, minLength: PASSWORD_MIN };
}

export const headers = formHeaders;

export async function action({ request, params }: Route.ActionArgs) {
  return handleForm(request, newPasswordSchema, async (input) => {
    await completePasswordReset(request, params.token, input);
    return redirect("/login?notice=reset");
  });
}

export default function ResetWithToken({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  if (!loaderData.valid || failure?.code === "expired") {
    return (
      <AuthCard title="This link no longer works">
        <Notice tone="error">This reset link has expired or was used already.</Notice>
        <Link to="/reset" className="text-spruce-700 underline">
          Ask for a new link
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password" intro="Setting it signs you out on every device; then sign in with the new one.">
      {failure ? (
        <Notice tone="error" focusOn={actionData}>
          {failure.message}
        </Notice>
      ) : null}
      <Form method="post" noValidate>
        <Field
          label="New password"
          name="password"
          clearOn={actionData}
          type="password"
          autoComplete="new-password"
          error={failure?.fields?.password}
          hint={`At least ${loaderData.minLength} characters; a short sentence works well.`}
        />
        <div className="mt-6">
          <SubmitButton>Set the new password</SubmitButton>
        </div>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
