import { Form, redirect } from "react-router";
import { z } from "zod";
import { AuthCard } from "~/components/auth-form";
import { Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { cancelLink, confirmLink, pendingLink } from "~/services/auth/github-accounts.server";
import { expiredCookie, linkCookie, returnToCookie } from "~/services/auth/github-flow.server";
import { safeRedirect } from "~/services/auth/redirect";
import { startSession } from "~/services/auth/session.server";
import { failureOf } from "~/utils/forms";
import { handleForm } from "~/utils/forms.server";
import type { Route } from "./+types/auth.github.link";

export const meta: Route.MetaFunction = () => [
  { title: "Link your GitHub identity · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

async function tokenOf(request: Request): Promise<string | null> {
  const value = await linkCookie().parse(request.headers.get("cookie"));
  return typeof value === "string" ? value : null;
}

export async function loader({ request }: Route.LoaderArgs) {
  const token = await tokenOf(request);
  const pending = token ? await pendingLink(await getDb(), token) : null;
  if (!pending) throw redirect("/login?notice=link-expired");
  return {
    name: pending.user.name,
    email: pending.user.email,
    login: pending.link.login,
    removesPassword: pending.unclaimed && !!pending.user.passwordHash,
  };
}

const answerSchema = z.object({ intent: z.enum(["link", "cancel"], { error: "Choose whether to link the accounts." }) });

/** Linking happens only on the member's explicit yes; either answer uses the pending token up. */
export async function action({ request }: Route.ActionArgs) {
  return handleForm(request, answerSchema, (answer) => answerLink(request, answer.intent));
}

async function answerLink(request: Request, intent: "link" | "cancel") {
  const token = await tokenOf(request);
  const headers = new Headers({ "Set-Cookie": expiredCookie(linkCookie().name) });
  headers.append("Set-Cookie", expiredCookie(returnToCookie().name));
  const db = await getDb();
  if (!token) return redirect("/login?notice=link-expired", { headers });
  if (intent === "cancel") {
    await cancelLink(db, token);
    return redirect("/login", { headers });
  }
  const confirmed = await confirmLink(db, token);
  if (!confirmed) return redirect("/login?notice=link-expired", { headers });
  const { user, passwordCleared } = confirmed;
  headers.append("Set-Cookie", await startSession(request, user.id));
  if (passwordCleared) {
    // The mail that says so is in the outbox (confirmLink). The account page says what changed and offers to set a new password.
    return redirect("/me/account?notice=password-cleared", { headers });
  }
  return redirect(safeRedirect(await returnToCookie().parse(request.headers.get("cookie"))), { headers });
}

export default function LinkGitHub({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <AuthCard title="Link your GitHub identity?">
      {failureOf(actionData) ? (
        <p role="alert">{failureOf(actionData)?.fields?.intent ?? failureOf(actionData)?.message}</p>
      ) : null}
      <p>
        GitHub says <strong>@{loaderData.login}</strong> owns the verified address <strong>{loaderData.email}</strong>, which
        belongs to the Torqueleaf account of <strong>{loaderData.name}</strong>.
      </p>
      <p className="mt-3 text-ink-soft">
        If that account is yours, link them: from then on either way of signing in opens the same account. If not, cancel and
        nothing changes.
      </p>
      {loaderData.removesPassword ? (
        <Notice tone="info">
          This account&apos;s address was never confirmed, so we cannot tell who chose its password. Linking confirms the address
          with GitHub&apos;s word, removes the password and signs out every device, so nobody else who knew it can sign in. You
          can set a new password on your account page afterwards.
        </Notice>
      ) : null}
      <Form method="post" className="mt-6 flex gap-3">
        <SubmitButton name="intent" value="link">
          Link and sign in
        </SubmitButton>
        <SubmitButton name="intent" value="cancel" tone="quiet">
          Cancel
        </SubmitButton>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
