import { Form, Link } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { Field, Notice, SubmitButton } from "~/components/form";
import { signUp, signUpSchema } from "~/services/auth/accounts.server";
import { PASSWORD_MIN } from "~/services/auth/fields.server";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import { redirectIfSignedIn } from "~/services/auth/guards.server";
import type { Route } from "./+types/signup";

export const meta: Route.MetaFunction = () => [
  { title: "Create an account · Torqueleaf" },
  { name: "description", content: "Join Torqueleaf to save your vehicles and parts checklists, and to write install guides." },
];

export async function loader(args: Route.LoaderArgs) {
  await redirectIfSignedIn(args);
  return { minLength: PASSWORD_MIN };
}

export const headers = formHeaders;

export async function action({ request }: Route.ActionArgs) {
  return handleForm(request, signUpSchema, async (input) => {
    await signUp(request, input);
    // The same answer whether or not the address already had an account.
    return { ok: true as const, email: input.email };
  });
}

export default function SignUp({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.ok) {
    return (
      <AuthCard title="Check your inbox">
        <Notice tone="success">
          We sent a message to <strong>{actionData.email}</strong>. Open the link in it to confirm the address, then sign in.
        </Notice>
        <p className="text-sm text-ink-soft">
          Nothing after a few minutes? Look in the spam folder, or{" "}
          <Link to="/login#resend" className="text-spruce-700 underline">
            ask for a new link
          </Link>
          .
        </p>
      </AuthCard>
    );
  }
  const failure = failureOf(actionData);
  const values = failure?.values ?? {};
  return (
    <AuthCard
      title="Create an account"
      intro={
        <>
          Readers save vehicles and checklists; accept the contributor terms later to write guides. Already a member?{" "}
          <Link to="/login" className="font-medium text-spruce-700 underline">
            Sign in
          </Link>
          .
        </>
      }
    >
      {failure ? (
        <Notice tone="error" focusOn={actionData}>
          {failure.message}
        </Notice>
      ) : null}
      <Form method="post" noValidate>
        <Field
          label="Name"
          name="name"
          autoComplete="name"
          defaultValue={values.name}
          error={failure?.fields?.name}
          hint="Shown beside your guides and comments."
        />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="email"
          defaultValue={values.email}
          error={failure?.fields?.email}
        />
        <Field
          label="Password"
          name="password"
          clearOn={actionData}
          type="password"
          autoComplete="new-password"
          error={failure?.fields?.password}
          hint={`At least ${loaderData.minLength} characters. Length beats symbols: a short sentence is a good password.`}
        />
        <div className="mt-6">
          <SubmitButton>Create my account</SubmitButton>
        </div>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
