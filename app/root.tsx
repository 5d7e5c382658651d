// First: the browser's side of the Content-Security-Policy must be in place before any schema is built.
import { useCspNonce } from "./services/http/csp";
import { data, isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { SiteFooter, SiteHeader } from "./components/chrome";
import { ErrorPage } from "./components/error-page";
import { FlashBanner } from "./components/form";
import { OfflineSupport } from "./components/offline-support";
import { crossSiteMiddleware } from "./services/auth/guards.server";
import { getUser, sessionMiddleware } from "./services/auth/session.server";
import { refusalShapeMiddleware, requestShapeMiddleware } from "./services/http/request-shape.server";
import { securityHeadersMiddleware } from "./services/http/security-headers.server";
import { env, standIns } from "./utils/env.server";
import { takeFlash } from "./utils/forms.server";
import { revalidateUnlessOffline } from "./utils/offline-answer";
import { permissionsFor } from "./utils/permissions";
import type { RootData } from "./utils/root-data";

export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" },
  // The installable app (public/manifest.webmanifest; PNG icons drawn at build time by app/cli/build-offline.ts).
  { rel: "manifest", href: "/manifest.webmanifest" },
  { rel: "apple-touch-icon", href: "/icons/icon-192.png" },
];

/**
 * Runs before every loader and action of every route, resource routes and /api included: give the
 * request its CSP nonce and put the security headers on the answer, give refusals their Allow header
 * and the API's error shape, refuse cross-site writes, then malformed ones (wrong method, body type
 * or an unreadable body), then load the session once for the whole request.
 */
export const middleware: Route.MiddlewareFunction[] = [
  securityHeadersMiddleware,
  refusalShapeMiddleware,
  crossSiteMiddleware,
  requestShapeMiddleware,
  sessionMiddleware,
];

/** The signed-in member and what they may do, so screens can hide what they cannot use (the server checks again). */
/** A page's change that never reached the server (no signal) reloads nothing (app/utils/offline-answer.ts). */
export const shouldRevalidate = revalidateUnlessOffline;

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
  const nonce = useCspNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#17413a" />
        {/* In development Vite adds the CSS as <style> elements, with the nonce it finds here. */}
        {import.meta.env.DEV ? <meta property="csp-nonce" nonce={nonce} /> : null}
        <Meta />
        <Links nonce={nonce} />
      </head>
      <body className="min-h-screen bg-paper font-sans text-ink flex flex-col">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <SiteHeader />
      <main id="main" tabIndex={-1} className="flex-1 focus:outline-none">
        {loaderData.flash ? <FlashBanner key={loaderData.flash.text} flash={loaderData.flash} /> : null}
        <Outlet />
      </main>
      <SiteFooter />
      <OfflineSupport reader={loaderData.user?.id ?? null} />
    </>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const status = isRouteErrorResponse(error) ? error.status : 500;
  return (
    <>
      <SiteHeader />
      <main id="main" tabIndex={-1} className="flex-1 focus:outline-none">
        <ErrorPage status={status} detail={isRouteErrorResponse(error) ? String(error.data ?? "") : undefined} />
      </main>
      <SiteFooter />
    </>
  );
}
