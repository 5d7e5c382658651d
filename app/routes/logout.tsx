import { Form, redirect } from "react-router";
import { AuthCard } from "~/components/auth-form";
import { SubmitButton } from "~/components/form";
import { endSession, getUser } from "~/services/auth/session.server";
import type { Route } from "./+types/logout";

export const meta: Route.MetaFunction = () => [{ title: "Sign out · Torqueleaf" }, { name: "robots", content: "noindex" }];

/** Signing out changes state, so it happens only by POST; this page offers the button for a direct visit. */
export async function loader(args: Route.LoaderArgs) {
  if (!(await getUser(args))) throw redirect("/");
  return null;
}

export async function action(args: Route.ActionArgs) {
  return redirect("/login?notice=signed-out", { headers: { "Set-Cookie": await endSession(args) } });
}

export default function Logout() {
  return (
    <AuthCard title="Sign out" intro="Sign out of Torqueleaf on this browser.">
      <Form method="post">
        <SubmitButton>Sign out</SubmitButton>
      </Form>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
