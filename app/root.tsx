import { data, isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { SiteFooter, SiteHeader } from "./components/chrome";
import { ErrorPage } from "./components/error-page";
import { FlashBanner } from "./components/form";
import { crossSiteMiddleware } from "./services/auth/guards.server";
import { getUser, sessionMiddleware } from "./services/auth/session.server";
import { env, standIns } from "./utils/env.server";
import { takeFlash } from "./utils/forms.server";
import { permissionsFor } from "./utils/permissions";
import type { RootData } from "./utils/root-data";

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

/**
 * Runs before every loader and action of every route, resource routes and /api included: refuse
 * cross-site writes first, then load the session once for the whole request.
 */
export const middleware: Route.MiddlewareFunction[] = [crossSiteMiddleware, sessionMiddleware];

/** The signed-in member and what they may do, so screens can hide what they cannot use (the server checks again). */
export async function loader(args: Route.LoaderArgs) {
  const user = await getUser(args);
  const { flash, headers } = await takeFlash(args.request);
  return data(
    {
      user: user ? { id: user.id, name: user.name, email: user.email, role: user.role } : null,
      permissions: user ? [...permissionsFor(user.role)] : [],
      devInbox: standIns(env()).mail,
      flash,
    } satisfies RootData,
    { headers },
  );
}

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#17413a" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen bg-paper font-sans text-ink flex flex-col">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <SiteHeader />
      <main className="flex-1">
        {loaderData.flash ? <FlashBanner key={loaderData.flash.text} flash={loaderData.flash} /> : null}
        <Outlet />
      </main>
      <SiteFooter />
    </>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const status = isRouteErrorResponse(error) ? error.status : 500;
  return (
    <>
      <SiteHeader />
      <main className="flex-1">
        <ErrorPage status={status} detail={isRouteErrorResponse(error) ? String(error.data ?? "") : undefined} />
      </main>
      <SiteFooter />
    </>
  );
}
