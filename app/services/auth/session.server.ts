import { createContext, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { getDb } from "~/db/client.server";
import type { User } from "~/db/schema";
import { createSession, findLiveSession, revokeSession, touchSession } from "~/models/sessions.server";
import { env } from "~/utils/env.server";
import { clientAddress } from "./client-address.server";
import { SESSION_DAYS, sessionCookie } from "./cookie.server";

export type AuthState = { user: User; sessionId: string } | null;

/** Set once per request by the root middleware; loaders and actions read it through the helpers below. */
export const authContext = createContext<AuthState>();

type Args = { request: Request; context?: unknown };

async function readToken(request: Request): Promise<{ token: string | null; present: boolean }> {
  const cookie = sessionCookie(env());
  const header = request.headers.get("cookie");
  const present = !!header && header.split(";").some((part) => part.trim().startsWith(`${cookie.name}=`));
  if (!present) return { token: null, present };
  // A value with a bad signature parses to null: a tampered cookie never reaches the database.
  const value = await cookie.parse(header);
  return { token: typeof value === "string" ? value : null, present };
}

/**
 * The request's session, looked up by the hash of the cookie's token. A disabled account's session
 * is ended here, so a disabled user is refused on the very next request.
 */
export async function resolveSession(request: Request): Promise<{ auth: AuthState; clearCookie: boolean }> {
  const { token, present } = await readToken(request);
  if (!token) return { auth: null, clearCookie: present };
  const db = await getDb();
  const row = await findLiveSession(db, token);
  if (!row) return { auth: null, clearCookie: true };
  if (row.user.disabledAt) {
    await revokeSession(db, row.session.id);
    return { auth: null, clearCookie: true };
  }
  await touchSession(db, row.session);
  return { auth: { user: row.user, sessionId: row.session.id }, clearCookie: false };
}

function fromContext(context: unknown): AuthState | undefined {
  const provider = context as RouterContextProvider | undefined;
  if (!provider || typeof provider.get !== "function") return undefined;
  try {
    return provider.get(authContext);
  } catch {
    return undefined;
  }
}

/** The signed-in user's session, from the middleware's context or, outside it, from the cookie. */
export async function getAuth({ request, context }: Args): Promise<AuthState> {
  const known = fromContext(context);
  if (known !== undefined) return known;
  return (await resolveSession(request)).auth;
}

export async function getUser(args: Args): Promise<User | null> {
  return (await getAuth(args))?.user ?? null;
}

export async function expiredSessionCookie() {
  return sessionCookie(env()).serialize("", { maxAge: 0, expires: new Date(0) });
}

/**
 * Signs a user in with a brand-new session id (a session id planted before sign-in is never
 * promoted, and the browser's previous session, if any, is ended). Returns the Set-Cookie value.
 */
export async function startSession(request: Request, userId: number): Promise<string> {
  const db = await getDb();
  const settings = env();
  const previous = await readToken(request);
  if (previous.token) {
    const row = await findLiveSession(db, previous.token);
    if (row) await revokeSession(db, row.session.id);
  }
  const { token } = await createSession(
    db,
    userId,
    { userAgent: request.headers.get("user-agent"), ipAddress: clientAddress(request, settings.TRUST_PROXY) },
    SESSION_DAYS,
  );
  return sessionCookie(settings).serialize(token);
}

/** Signs out this browser: the session row is revoked, so a copied cookie stops working too. */
export async function endSession(args: Args): Promise<string> {
  const auth = await getAuth(args);
  if (auth) await revokeSession(await getDb(), auth.sessionId);
  return expiredSessionCookie();
}

function withCookie(response: Response, cookie: string): Response {
  try {
    response.headers.append("Set-Cookie", cookie);
    return response;
  } catch {
    // Some responses have immutable headers; copy them into one we can change.
    const copy = new Response(response.body, response);
    copy.headers.append("Set-Cookie", cookie);
    return copy;
  }
}

/** Loads the session for every request and clears a cookie that no longer names a live session. */
export const sessionMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  const { auth, clearCookie } = await resolveSession(request);
  context.set(authContext, auth);
  if (!clearCookie) return next();
  const clear = async (response: Response) => {
    const name = sessionCookie(env()).name;
    if (response.headers.getSetCookie().some((c) => c.startsWith(`${name}=`))) return response;
    return withCookie(response, await expiredSessionCookie());
  };
  try {
    return await clear(await next());
  } catch (thrown) {
    // A redirect thrown by a guard (to the sign-in page) should clear the dead cookie too.
    if (thrown instanceof Response) throw await clear(thrown);
    throw thrown;
  }
};
