import { Form, Link } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { Field, Notice, SubmitButton } from "~/components/form";
import { TOKEN_TTL } from "~/models/user-tokens.server";
import { requestPasswordReset } from "~/services/auth/accounts.server";
import { emailOnlySchema } from "~/services/auth/fields.server";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import type { Route } from "./+types/reset";

export const meta: Route.MetaFunction = () => [
  { title: "Reset your password · Torqueleaf" },
  { name: "description", content: "Get a link to choose a new Torqueleaf password." },
];

export function loader() {
  return { minutes: Math.round(TOKEN_TTL["reset-password"] / 60_000) };
}

export const headers = formHeaders;

export async function action({ request }: Route.ActionArgs) {
  return handleForm(request, emailOnlySchema, async (input) => {
    await requestPasswordReset(request, input);
    // Said whether or not the address has an account.
    return { ok: true as const, email: input.email };
  });
}

export default function Reset({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  return (
    <AuthCard title="Reset your password" intro="Tell us the address you signed up with and we will mail you a link.">
      {actionData?.ok ? (
        <Notice tone="success">
          If an account uses <strong>{actionData.email}</strong>, a link is on its way. It works once, for {loaderData.minutes}{" "}
          minutes.
        </Notice>
      ) : null}
      {failure ? (
        <Notice tone="error" focusOn={actionData}>
          {failure.message}
        </Notice>
      ) : null}
      <Form method="post" noValidate>
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="email"
          defaultValue={failure?.values?.email}
          error={failure?.fields?.email}
        />
        <div className="mt-6 flex items-center justify-between">
          <SubmitButton>Send the link</SubmitButton>
          <Link to="/login" className="inline-flex min-h-11 items-center text-sm text-spruce-700 underline">
            Back to sign-in
          </Link>
        </div>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
