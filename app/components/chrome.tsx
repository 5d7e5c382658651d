import { type KeyboardEvent, useEffect, useRef, useState } from "react";
import { Form, Link, NavLink, useLocation } from "react-router";
import { type RootData, useRootData } from "~/utils/root-data";
import { ROLE_LABELS } from "~/utils/vocab";

export function LogoMark({ className = "h-9 w-9" }: { className?: string }) {
  return <img src="/logo.svg" alt="" className={className} width={36} height={36} />;
}

const navClass = ({ isActive }: { isActive: boolean }) =>
  `inline-flex min-h-11 items-center rounded-md px-3 py-2 text-sm font-medium ${isActive ? "bg-spruce-700 text-paper" : "text-spruce-100 hover:bg-spruce-700/60 hover:text-paper"}`;

/**
 * The signed-in member's menu. Entries show only for the permission (or role) that can use them;
 * the pages check again on the server. Add an entry here when a new area opens.
 */
const MENU: { to: string; label: string; permission?: string; role?: string }[] = [
  { to: "/me/account", label: "Account and sessions" },
  { to: "/me/vehicles", label: "My vehicles" },
  { to: "/me/checklists", label: "Parts checklists", permission: "manage:checklist:own" },
  { to: "/workbench", label: "Workbench: my guides", permission: "create:guide" },
  { to: "/review", label: "Review desk", permission: "review:revision:any" },
  { to: "/contributor-terms", label: "Write guides for Torqueleaf", role: "reader" },
  { to: "/admin/users", label: "Users and roles", permission: "manage:users" },
  { to: "/admin/catalogue", label: "Vehicle catalogue", permission: "manage:catalogue" },
  { to: "/admin/audit", label: "Audit log", permission: "read:audit" },
];

function UserMenu({ user, permissions }: { user: NonNullable<RootData["user"]>; permissions: string[] }) {
  const entries = MENU.filter((e) => (!e.permission || permissions.includes(e.permission)) && (!e.role || e.role === user.role));
  // Keyed by the address, so the menu closes when one of its links is followed.
  const { pathname } = useLocation();
  const menu = useRef<HTMLDetailsElement>(null);
  const [open, setOpen] = useState(false);
  // While it is open, a click or a tap anywhere else closes it.
  useEffect(() => {
    if (!open) return;
    const close = (event: PointerEvent) => {
      if (menu.current && !menu.current.contains(event.target as Node)) menu.current.open = false;
    };
    document.addEventListener("pointerdown", close);
    return () => document.removeEventListener("pointerdown", close);
  }, [open]);
  // Escape closes it and gives the focus back to its button.
  const onKeyDown = (event: KeyboardEvent<HTMLDetailsElement>) => {
    if (event.key !== "Escape" || !menu.current?.open) return;
    event.preventDefault();
    menu.current.open = false;
    menu.current.querySelector("summary")?.focus();
  };
  return (
    <details
      key={pathname}
      ref={menu}
      className="group relative"
      onToggle={(event) => setOpen(event.currentTarget.open)}
      onKeyDown={onKeyDown}
    >
      <summary className="flex min-h-11 cursor-pointer list-none items-center gap-2 rounded-md px-3 py-2 font-medium text-paper hover:bg-spruce-700/60">
        <span
          aria-hidden="true"
          className="grid h-7 w-7 place-items-center rounded-full bg-brass-100 font-semibold text-spruce-900"
        >
          {user.name.trim().charAt(0).toUpperCase() || "?"}
        </span>
        {/* On a phone the initial alone, so the menu keeps to the row of the name. */}
        <span className="sr-only sm:not-sr-only">{user.name}</span>
        <span className="sr-only">, account menu</span>
      </summary>
      <div className="absolute right-0 z-20 mt-2 w-64 max-w-[calc(100vw-2rem)] rounded-lg border border-rule bg-white p-2 text-ink shadow-lg">
        <p className="px-3 py-2 text-xs text-ink-soft">
          {user.email}
          <br />
          {ROLE_LABELS[user.role]}
        </p>
        <ul>
          {entries.map((e) => (
            <li key={e.to}>
              <Link to={e.to} className="flex min-h-11 items-center rounded-md px-3 py-2 hover:bg-paper-deep">
                {e.label}
              </Link>
            </li>
          ))}
        </ul>
        <Form method="post" action="/logout" className="mt-1 border-t border-rule pt-1">
          <button type="submit" className="min-h-11 w-full rounded-md px-3 py-2 text-left hover:bg-paper-deep">
            Sign out
          </button>
        </Form>
      </div>
    </details>
  );
}

export function SiteHeader() {
  const root = useRootData();
  return (
    <header className="no-print bg-spruce-800 text-paper">
      {/* The first stop for the keyboard on every page: straight past the header to the page itself. */}
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-4 focus:top-3 focus:z-50 focus:inline-flex focus:min-h-11 focus:items-center focus:rounded-md focus:bg-paper focus:px-4 focus:py-2 focus:font-semibold focus:text-spruce-900"
      >
        Skip to content
      </a>
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3 sm:px-6">
        <Link to="/" className="flex min-h-11 items-center gap-3">
          <LogoMark className="h-9 w-9 rounded-lg bg-paper p-0.5" />
          <span className="font-serif text-2xl font-semibold tracking-tight">Torqueleaf</span>
        </Link>
        {/* On a phone the menu takes its own row under the name, so nothing stacks beside the logo. */}
        <nav aria-label="Main" className="order-last flex w-full flex-wrap items-center gap-1 sm:order-none sm:w-auto sm:flex-1">
          <NavLink to="/" end className={navClass}>
            Library
          </NavLink>
          <NavLink to="/tools/circuit" className={navClass}>
            Circuit planner
          </NavLink>
        </nav>
        <div className="ml-auto flex items-center gap-2 text-sm sm:ml-0">
          {root?.user ? (
            <UserMenu user={root.user} permissions={root.permissions} />
          ) : (
            <>
              <Link
                to="/login"
                className="inline-flex min-h-11 items-center rounded-md px-3 py-2 font-medium text-spruce-100 hover:text-paper"
              >
                Sign in
              </Link>
              <Link
                to="/signup"
                className="inline-flex min-h-11 items-center rounded-md bg-brass-100 px-3 py-2 font-semibold text-spruce-900 hover:bg-paper"
              >
                Join
              </Link>
            </>
          )}
        </div>
      </div>
    </header>
  );
}

/** The standing notice every page carries: the work can hurt people, and the maker's word governs. */
export function SafetyNotice({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-label="Safety notice"
      className={`rounded-lg border-l-4 border-z-warning bg-brass-50 ${compact ? "px-4 py-3 text-sm" : "px-5 py-4"} text-ink`}
    >
      <p>
        <strong className="font-semibold">Work safely.</strong> Guides and calculations here are planning aids. Follow the vehicle
        maker's instructions and torque values, local codes and licensed practice. Have a qualified technician do or check work on
        high-voltage systems (orange cables) and near airbags, and never work under a vehicle held only by a jack.
      </p>
    </aside>
  );
}

export function SiteFooter() {
  const root = useRootData();
  return (
    <footer className="no-print mt-16 border-t border-rule bg-paper-deep">
      <div className="mx-auto grid max-w-6xl gap-6 px-4 py-8 sm:px-6 text-sm text-ink-soft md:grid-cols-[2fr_1fr]">
        <div>
          <div className="flex items-center gap-2 text-spruce-800">
            <LogoMark className="h-6 w-6" />
            <span className="font-serif text-lg font-semibold">Torqueleaf</span>
          </div>
          <p className="mt-2 max-w-prose">
            Install guides for vehicle accessories, written by owners and shop technicians and reviewed by editors before they go
            live. Every fuse, wire size and torque value is checked by computation, with its sources shown.
          </p>
        </div>
        <ul>
          <li>
            <Link className="inline-flex min-h-11 items-center hover:text-spruce-800 hover:underline" to="/">
              Library
            </Link>
          </li>
          <li>
            <Link className="inline-flex min-h-11 items-center hover:text-spruce-800 hover:underline" to="/tools/circuit">
              Circuit planner
            </Link>
          </li>
          {root?.devInbox ? (
            <li>
              <a className="inline-flex min-h-11 items-center hover:text-spruce-800 hover:underline" href="/dev/inbox">
                Development inbox
              </a>
            </li>
          ) : null}
        </ul>
      </div>
    </footer>
  );
}
