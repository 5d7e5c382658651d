import { type MiddlewareFunction, redirect } from "react-router";
import type { User } from "~/db/schema";
import { env } from "~/utils/env.server";
import { AppError, forbidden, unauthorized } from "~/utils/errors";
import { errorResponse, pageErrorResponse } from "~/utils/http.server";
import { can, type Permission } from "~/utils/permissions";
import { CROSS_SITE_MESSAGE, isAllowedWrite, isOneClickOptOut } from "./origin.server";
import { getUser } from "./session.server";

type Args = { request: Request; context?: unknown };

const isApi = (request: Request) => new URL(request.url).pathname.startsWith("/api/");

/**
 * The signed-in user, or the answer for someone who is not: the API says 401 in its error shape,
 * a page sends them to sign in and back here afterwards.
 */
export async function requireUser(args: Args): Promise<User> {
  const user = await getUser(args);
  if (user) return user;
  if (isApi(args.request)) throw errorResponse(unauthorized());
  const url = new URL(args.request.url);
  throw redirect(`/login?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
}

/** The signed-in user holding `permission`; 401 or the sign-in page without a user, 403 without the permission. */
export async function requirePermission(args: Args, permission: Permission): Promise<User> {
  const user = await requireUser(args);
  if (can(user, permission)) return user;
  const refusal = forbidden();
  throw isApi(args.request) ? errorResponse(refusal) : pageErrorResponse(refusal);
}

/** Pages for people who are not signed in (sign-in, sign-up, reset) send a signed-in visitor onwards. */
export async function redirectIfSignedIn(args: Args, to = "/") {
  if (await getUser(args)) throw redirect(to);
}

/**
 * Refuses every write that did not come from our own pages, before any loader or action runs, on
 * pages, resource routes and /api alike. The one exception is a mail's one-click opt-out (see
 * `isOneClickOptOut`), which a signed token authorises instead.
 */
export const crossSiteMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  if (isAllowedWrite(request, env().APP_ORIGIN) || isOneClickOptOut(request)) return next();
  const refusal = new AppError(403, "cross-site", CROSS_SITE_MESSAGE);
  if (isApi(request)) return errorResponse(refusal);
  throw pageErrorResponse(refusal);
};
