import { Form, Link, redirect } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { Field, Notice, SubmitButton } from "~/components/form";
import { resendConfirmation } from "~/services/auth/accounts.server";
import { authenticator } from "~/services/auth/authenticator.server";
import { z } from "zod";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import { rememberDevice } from "~/services/auth/device.server";
import { redirectIfSignedIn } from "~/services/auth/guards.server";
import { safeRedirect } from "~/services/auth/redirect";
import { hasVehicleCookie } from "~/services/vehicle-cookie.server";
import { startSession } from "~/services/auth/session.server";
import type { Route } from "./+types/login";

export const meta: Route.MetaFunction = () => [
  { title: "Sign in · Torqueleaf" },
  { name: "description", content: "Sign in to save vehicles and checklists, write guides or review them." },
];

/** Messages other steps send people here with; a fixed list, so an address cannot inject text. */
const NOTICES: Record<string, { tone: "success" | "info" | "error"; text: string }> = {
  verified: { tone: "success", text: "Your address is confirmed. Sign in to continue." },
  reset: { tone: "success", text: "Your new password is set and every device was signed out. Sign in with it now." },
  "signed-out": { tone: "info", text: "You are signed out." },
  everywhere: { tone: "info", text: "You are signed out on every device." },
  "github-failed": { tone: "error", text: "Sign-in with GitHub did not finish. Try again, or use your e-mail and password." },
  "github-disabled": { tone: "error", text: "The account linked to that GitHub identity has been disabled." },
  "github-no-email": {
    tone: "error",
    text: "GitHub did not share a verified e-mail address, so we cannot create an account from it. Verify an address on GitHub, or sign up here with your e-mail.",
  },
  "link-expired": { tone: "info", text: "That link request expired or was already answered. Sign in again to continue." },
};

export async function loader(args: Route.LoaderArgs) {
  const params = new URL(args.request.url).searchParams;
  const redirectTo = safeRedirect(params.get("redirectTo"), "");
  await redirectIfSignedIn(args, redirectTo || "/");
  return { redirectTo, notice: NOTICES[params.get("notice") ?? ""] ?? null };
}

export const headers = formHeaders;

/** The two forms on this page; the services check the fields themselves, with their own messages. */
const loginForm = z.object({
  intent: z.enum(["sign-in", "resend"]).default("sign-in"),
  email: z.string().max(1000).default(""),
  password: z.string().max(1000).default(""),
  redirectTo: z.string().max(2000).optional(),
});

export async function action({ request }: Route.ActionArgs) {
  // The password strategy reads the body itself, so the form is read from a copy.
  return handleForm(request.clone(), loginForm, async (input) => {
    if (input.intent === "resend") {
      await resendConfirmation(request, input);
      return {
        ok: true as const,
        resent: true,
        message: "If that address has an account waiting for confirmation, a new link is on its way.",
      };
    }
    const signed = await authenticator().authenticate("password", request);
    if (signed.kind !== "password") throw new Error("the password strategy returned another kind of sign-in");
    const headers = new Headers({ "Set-Cookie": await startSession(request, signed.user.id) });
    // Remembers this browser, so a guesser on the same address cannot lock the owner out of it.
    headers.append("Set-Cookie", await rememberDevice(request, signed.user.id));
    // A vehicle picked before signing in is offered on My vehicles, unless the reader was going somewhere.
    return redirect(safeRedirect(input.redirectTo, hasVehicleCookie(request) ? "/me/vehicles" : "/"), { headers });
  });
}

export default function Login({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  const resent = actionData?.ok ? actionData : null;
  const values = failure?.values ?? {};
  const github = `/auth/github${loaderData.redirectTo ? `?redirectTo=${encodeURIComponent(loaderData.redirectTo)}` : ""}`;
  const unconfirmed = failure?.fields?.email === "This address is not confirmed yet.";
  return (
    <AuthCard
      title="Sign in"
      intro={
        <>
          New here?{" "}
          <Link to="/signup" className="font-medium text-spruce-700 underline">
            Create an account
          </Link>
          .
        </>
      }
    >
      {loaderData.notice ? <Notice tone={loaderData.notice.tone}>{loaderData.notice.text}</Notice> : null}
      {failure && values.intent !== "resend" ? (
        <Notice tone="error" focusOn={actionData}>
          {failure.message}
        </Notice>
      ) : null}
      <Form method="post" noValidate>
        <input type="hidden" name="redirectTo" value={loaderData.redirectTo} />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          autoComplete="username"
          defaultValue={values.email}
          error={values.intent === "resend" ? undefined : failure?.fields?.email}
        />
        <Field
          label="Password"
          name="password"
          clearOn={actionData}
          type="password"
          autoComplete="current-password"
          error={failure?.fields?.password}
        />
        <div className="mt-6 flex items-center justify-between gap-3">
          <SubmitButton>Sign in</SubmitButton>
          <Link to="/reset" className="inline-flex min-h-11 items-center text-sm text-spruce-700 underline">
            Forgot your password?
          </Link>
        </div>
      </Form>

      <div className="my-6 flex items-center gap-3 text-xs uppercase tracking-wider text-ink-soft">
        <span className="h-px flex-1 bg-rule" /> or <span className="h-px flex-1 bg-rule" />
      </div>
      <a
        href={github}
        className="flex min-h-11 items-center justify-center rounded-md border border-spruce-800 px-4 py-2 text-center font-semibold text-spruce-800 hover:bg-spruce-50"
      >
        Sign in with GitHub
      </a>

      <details id="resend" className="mt-6 text-sm" open={unconfirmed || values.intent === "resend"}>
        <summary className="flex min-h-11 cursor-pointer items-center text-ink-soft">Did not get the confirmation mail?</summary>
        {resent ? (
          <p className="mt-2 text-spruce-800" role="status">
            {resent.message}
          </p>
        ) : null}
        {failure && values.intent === "resend" ? (
          <Notice tone="error" focusOn={actionData}>
            {failure.message}
          </Notice>
        ) : null}
        <Form method="post" className="mt-3" noValidate>
          <input type="hidden" name="intent" value="resend" />
          <Field
            label="E-mail address for the new link"
            id="resend-email"
            name="email"
            type="email"
            defaultValue={values.email}
            error={values.intent === "resend" ? failure?.fields?.email : undefined}
          />
          <div className="mt-3">
            <SubmitButton tone="quiet">Send a new link</SubmitButton>
          </div>
        </Form>
      </details>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
