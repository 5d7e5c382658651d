import { redirect } from "react-router";
import { startGitHubSignIn } from "~/services/auth/github-flow.server";
import { getUser } from "~/services/auth/session.server";
import type { Route } from "./+types/auth.github";

/** Starts sign-in with GitHub (a link or a form may lead here); a signed-in member goes to their account. */
export async function loader(args: Route.LoaderArgs) {
  if (await getUser(args)) return redirect("/me/account");
  return startGitHubSignIn(args.request);
}

export const action = loader;
