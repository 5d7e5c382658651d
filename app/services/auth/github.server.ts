import { OAuth2Client, type OAuth2Tokens } from "arctic";
import { GitHubStrategy } from "remix-auth-github";
import { z } from "zod";
import type { Env } from "~/utils/env.server";
import { cookieIsSecure, cookieName } from "./cookie.server";

export const GITHUB = "github";

const profileSchema = z.object({
  id: z.number().int().positive(),
  login: z.string(),
  name: z.string().nullish(),
});
const emailsSchema = z.array(z.object({ email: z.string(), primary: z.boolean(), verified: z.boolean() }));

export type GitHubProfile = z.infer<typeof profileSchema> & { emails: z.infer<typeof emailsSchema> };

/** Something went wrong on the provider's side of the sign-in; the user is told to try again. */
export class GitHubSignInError extends Error {}

/**
 * The strategy's built-in client always talks to github.com. This one has the same three methods
 * over arctic's generic OAuth 2.0 client, pointed at any server with GitHub's paths: the local
 * stand-in in development and tests, or GitHub itself when GITHUB_BASE_URL says so.
 */
export class GitHubCompatibleClient {
  private readonly oauth: OAuth2Client;
  private readonly authorizeUrl: string;
  private readonly tokenUrl: string;

  constructor(options: { clientId: string; clientSecret: string; redirectURI: string; baseUrl: string }) {
    this.oauth = new OAuth2Client(options.clientId, options.clientSecret, options.redirectURI);
    const base = options.baseUrl.replace(/\/+$/, "");
    this.authorizeUrl = `${base}/login/oauth/authorize`;
    this.tokenUrl = `${base}/login/oauth/access_token`;
  }

  createAuthorizationURL(state: string, scopes: string[]): URL {
    return this.oauth.createAuthorizationURL(this.authorizeUrl, state, scopes);
  }

  validateAuthorizationCode(code: string): Promise<OAuth2Tokens> {
    return this.oauth.validateAuthorizationCode(this.tokenUrl, code, null);
  }

  refreshAccessToken(refreshToken: string): Promise<OAuth2Tokens> {
    return this.oauth.refreshAccessToken(this.tokenUrl, refreshToken, []);
  }
}

/** The profile and e-mail addresses, as GitHub's REST API gives them to the token's holder. */
export async function fetchGitHubProfile(apiUrl: string, accessToken: string): Promise<GitHubProfile> {
  const base = (apiUrl || "https://api.github.com").replace(/\/+$/, "");
  const headers = {
    authorization: `Bearer ${accessToken}`,
    accept: "application/vnd.github+json",
    "user-agent": "Torqueleaf",
  };
  const [userResponse, emailsResponse] = await Promise.all([
    fetch(`${base}/user`, { headers }),
    fetch(`${base}/user/emails`, { headers }),
  ]);
  if (!userResponse.ok || !emailsResponse.ok) {
    throw new GitHubSignInError(`GitHub answered ${userResponse.status} / ${emailsResponse.status} for the profile`);
  }
  const profile = profileSchema.safeParse(await userResponse.json());
  const emails = emailsSchema.safeParse(await emailsResponse.json());
  if (!profile.success || !emails.success) throw new GitHubSignInError("GitHub's profile was not in the expected shape");
  return { ...profile.data, emails: emails.data };
}

export const githubStateCookieName = (settings: Pick<Env, "NODE_ENV" | "APP_ORIGIN">) =>
  cookieName("tl_github_state", cookieIsSecure(settings));

export function createGitHubStrategy<T>(settings: Env, verify: (profile: GitHubProfile) => Promise<T>) {
  const redirectURI = `${settings.APP_ORIGIN}/auth/github/callback`;
  const secure = cookieIsSecure(settings);
  const strategy = new GitHubStrategy<T>(
    {
      clientId: settings.GITHUB_CLIENT_ID,
      clientSecret: settings.GITHUB_CLIENT_SECRET,
      redirectURI,
      scopes: ["read:user", "user:email"],
      cookie: {
        name: githubStateCookieName(settings),
        httpOnly: true,
        sameSite: "Lax",
        path: "/",
        ...(secure ? { secure: true } : {}),
      },
    },
    async ({ tokens }) => verify(await fetchGitHubProfile(settings.GITHUB_API_URL, tokens.accessToken())),
  );
  if (settings.GITHUB_BASE_URL) {
    // The strategy reads its public `client` field for every call; the typings mark it protected.
    (strategy as unknown as { client: GitHubCompatibleClient }).client = new GitHubCompatibleClient({
      clientId: settings.GITHUB_CLIENT_ID,
      clientSecret: settings.GITHUB_CLIENT_SECRET,
      redirectURI,
      baseUrl: settings.GITHUB_BASE_URL,
    });
  }
  return strategy;
}
