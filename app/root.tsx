import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { SiteFooter, SiteHeader } from "./components/chrome";
import { ErrorPage } from "./components/error-page";
import { env } from "./utils/env.server";

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export async function loader(_: Route.LoaderArgs) {
  return {
    user: null as null | { id: number; name: string; role: string },
    permissions: [] as string[],
    devInbox: env().LOCAL_FAKES,
  };
}

export type RootData = Awaited<ReturnType<typeof loader>>;

export function useRootData() {
  return useRouteLoaderData<RootData>("root");
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

export default function App() {
  return (
    <>
      <SiteHeader />
      <main className="flex-1">
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
