import { finishGitHubSignIn } from "~/services/auth/github-flow.server";
import type { Route } from "./+types/auth.github.callback";

export async function loader({ request }: Route.LoaderArgs) {
  return finishGitHubSignIn(request);
}
