import { redirect } from "react-router";
import { getDb } from "~/db/client.server";
import { env } from "~/utils/env.server";
import { authenticator } from "./authenticator.server";
import { flowCookie } from "./cookie.server";
import { githubStateCookieName } from "./github.server";
import { resolveGitHubIdentity } from "./github-accounts.server";
import { safeRedirect } from "./redirect";
import { startSession } from "./session.server";

const TEN_MINUTES = 10 * 60;

/** The sign-in page's notice for each refusal (the keys of its fixed list of notices). */
const REFUSED_NOTICE = { disabled: "github-disabled", "no-verified-email": "github-no-email" } as const;

/** Where to go after the round trip to GitHub, kept in a signed cookie for the trip's length. */
export const returnToCookie = () => flowCookie("tl_return_to", TEN_MINUTES, env());
/** The pending link's token while the member decides, never in an address bar or a log. */
export const linkCookie = () => flowCookie("tl_github_link", TEN_MINUTES, env());

const expire = (name: string) =>
  `${name}=; Path=/; Max-Age=0; HttpOnly; SameSite=Lax${name.startsWith("__Host-") ? "; Secure" : ""}`;

/** Sends the browser to GitHub's authorize page; the strategy sets the state cookie that the callback checks. */
export async function startGitHubSignIn(request: Request): Promise<Response> {
  const returnTo = safeRedirect(new URL(request.url).searchParams.get("redirectTo"));
  try {
    await authenticator().authenticate("github", request);
  } catch (thrown) {
    if (thrown instanceof Response && thrown.status >= 300 && thrown.status < 400) {
      const response = new Response(null, thrown);
      response.headers.append("Set-Cookie", await returnToCookie().serialize(returnTo));
      return response;
    }
    throw thrown;
  }
  throw new Error("the GitHub strategy did not redirect to the provider");
}

/** GitHub sent the browser back: check the state, read the profile, and sign in, create, or ask to link. */
export async function finishGitHubSignIn(request: Request): Promise<Response> {
  const returnTo = safeRedirect(await returnToCookie().parse(request.headers.get("cookie")));
  // The state cookie has done its job whatever happens next.
  const headers = new Headers({ "Set-Cookie": expire(githubStateCookieName(env())) });
  const done = async (to: string, cookies: string[] = []) => {
    if (!cookies.some((c) => c.startsWith(`${returnToCookie().name}=`)))
      headers.append("Set-Cookie", expire(returnToCookie().name));
    for (const cookie of cookies) headers.append("Set-Cookie", cookie);
    return redirect(to, { headers });
  };

  let signed: Awaited<ReturnType<ReturnType<typeof authenticator>["authenticate"]>>;
  try {
    signed = await authenticator().authenticate("github", request);
  } catch (thrown) {
    // A callback without state starts the trip again; any other failure (state mismatch, a refused code) ends it.
    if (thrown instanceof Response) return thrown;
    return done("/login?notice=github-failed");
  }
  if (signed.kind !== "github") return done("/login?notice=github-failed");

  const outcome = await resolveGitHubIdentity(await getDb(), signed.profile);
  switch (outcome.kind) {
    case "signed-in":
      return done(returnTo, [await startSession(request, outcome.user.id)]);
    case "confirm-link":
      // The destination waits in its cookie until the member has answered.
      return done("/auth/github/link", [await linkCookie().serialize(outcome.token), await returnToCookie().serialize(returnTo)]);
    case "refused":
      return done(`/login?notice=${REFUSED_NOTICE[outcome.reason]}`);
  }
}

export { expire as expiredCookie };
