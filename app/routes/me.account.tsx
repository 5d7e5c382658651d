import { Form, Link } from "react-router";
import { Field, Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { mailOptOutsOf } from "~/models/mail-preferences.server";
import { recentFailedAttempts } from "~/models/rate-limit.server";
import { describeSession, listLiveSessions, plainAddress } from "~/models/sessions.server";
import { listOAuthAccounts } from "~/models/users.server";
import { formHeaders } from "~/utils/forms.server";
import { requireUser } from "~/services/auth/guards.server";
import { getAuth } from "~/services/auth/session.server";
import { failureOf } from "~/utils/forms";
import { formatDateTime } from "~/utils/format";
import { MAIL_KIND_INFO } from "~/utils/mail-kinds";
import type { Route } from "./+types/me.account";
import { accountAction, mailField, mailKindsShown } from "./me.account.server";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Torqueleaf" }, { name: "robots", content: "noindex" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const auth = (await getAuth(args))!;
  const db = await getDb();
  const [sessions, linked, failed, mailOff] = await Promise.all([
    listLiveSessions(db, user.id),
    listOAuthAccounts(db, user.id),
    recentFailedAttempts(db, user.id),
    mailOptOutsOf(db, user.id),
  ]);
  const notice = NOTICES[new URL(args.request.url).searchParams.get("notice") ?? ""] ?? null;
  return {
    account: {
      name: user.name,
      email: user.email,
      role: user.role,
      hasPassword: !!user.passwordHash,
      termsAcceptedAt: user.termsAcceptedAt,
    },
    sessions: sessions.map((s) => ({ ...describeSession(s), current: s.id === auth.sessionId })),
    linked,
    mail: mailKindsShown(user.role, mailOff).map((kind) => ({
      kind,
      field: mailField(kind),
      ...MAIL_KIND_INFO[kind],
      on: !mailOff.includes(kind),
    })),
    failed: {
      ...failed,
      attempts: failed.attempts.map((a) => ({ ...a, ipAddress: plainAddress(a.ipAddress) ?? "an unknown address" })),
      addresses: failed.addresses.map((a) => ({ ...a, ipAddress: plainAddress(a.ipAddress) ?? "an unknown address" })),
    },
    notice,
  };
}

/** Messages other steps send people here with; a fixed list, so an address cannot inject text. */
const NOTICES: Record<string, string> = {
  "password-cleared":
    "Your account is linked to GitHub and your address is confirmed. Its address had never been confirmed, so we removed the password it was created with and signed out every device: if someone else opened the account with your address, they cannot sign in any more. Set a password below to sign in with your e-mail too.",
};

const ATTEMPT_KINDS: Record<string, string> = {
  "sign-in": "Wrong password at sign-in",
  "current-password": "Wrong current password on this page",
};

export const action = (args: Route.ActionArgs) => accountAction(args);

export const headers = formHeaders;

// A fixed time zone, so the server's page and the browser's render say the same thing.
const when = (d: Date | string) => formatDateTime(d);

function Section({ title, id, children }: { title: string; id?: string; children: React.ReactNode }) {
  return (
    <section id={id} className="mt-8 scroll-mt-6 rounded-xl border border-rule bg-white p-6 shadow-sm">
      <h2 className="font-serif text-2xl font-semibold text-spruce-900">{title}</h2>
      <div className="mt-4">{children}</div>
    </section>
  );
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { account, sessions, linked, mail, failed, notice } = loaderData;
  // Success comes back as a flash message after a redirect; only a refusal is answered here.
  const failure = failureOf(actionData);
  const values = failure?.values ?? {};
  const fields = failure?.fields ?? {};
  const intent = values.intent;
  const message = (forIntent: string) =>
    failure && intent === forIntent ? <Notice tone="error">{failure.message}</Notice> : null;

  return (
    <div className="mx-auto max-w-3xl px-4 py-10 sm:px-6">
      <h1 className="font-serif text-4xl font-semibold tracking-tight text-spruce-900">Your account</h1>
      <p className="mt-2 text-ink-soft">
        {account.email} · <span className="capitalize">{account.role}</span>
        {account.role === "reader" ? (
          <>
            {" · "}
            <Link to="/contributor-terms" className="text-spruce-700 underline">
              Write guides
            </Link>
          </>
        ) : null}
      </p>

      {notice ? (
        <div className="mt-6">
          <Notice tone="info">{notice}</Notice>
        </div>
      ) : null}

      <Section title="Name">
        {message("profile")}
        <Form method="post" noValidate>
          <input type="hidden" name="intent" value="profile" />
          <Field
            label="Name shown on your guides"
            name="name"
            defaultValue={values.name ?? account.name}
            error={intent === "profile" ? fields.name : undefined}
          />
          <div className="mt-4">
            <SubmitButton>Save the name</SubmitButton>
          </div>
        </Form>
      </Section>

      <Section title="Password">
        {message("password")}
        <Form method="post" noValidate>
          <input type="hidden" name="intent" value="password" />
          {account.hasPassword ? (
            <Field
              label="Current password"
              name="currentPassword"
              clearOn={actionData}
              type="password"
              autoComplete="current-password"
              error={fields.currentPassword}
            />
          ) : (
            <p className="mb-3 text-sm text-ink-soft">
              You sign in with GitHub. Set a password to sign in with your e-mail address too.
            </p>
          )}
          <Field
            label="New password"
            name="newPassword"
            clearOn={actionData}
            type="password"
            autoComplete="new-password"
            error={fields.newPassword}
            hint="At least 8 characters. Changing it signs out your other devices."
          />
          <div className="mt-4">
            <SubmitButton>{account.hasPassword ? "Change the password" : "Set the password"}</SubmitButton>
          </div>
        </Form>
        {linked.length ? (
          <p className="mt-4 text-sm text-ink-soft">
            Also signs in with:{" "}
            {linked.map((l) => `${l.provider === "github" ? "GitHub" : l.provider} (${l.email ?? "no address"})`).join(", ")}
          </p>
        ) : null}
      </Section>

      <Section title="Mail" id="mail">
        {message("mail")}
        <p className="text-sm text-ink-soft">
          Mail about your account itself (confirming your address, resetting or changing your password) always comes. Choose which
          notices you get besides; every notice also has a link to turn its kind off.
        </p>
        {mail.length ? (
          <Form method="post" className="mt-4">
            <input type="hidden" name="intent" value="mail" />
            <fieldset>
              <legend className="sr-only">Notices to get by mail</legend>
              <ul className="space-y-3">
                {mail.map((m) => (
                  <li key={m.kind}>
                    <label className="flex min-h-11 cursor-pointer items-start gap-3">
                      <input
                        type="checkbox"
                        name={m.field}
                        defaultChecked={intent === "mail" ? values[m.field] === "on" : m.on}
                        className="mt-1 size-5 shrink-0 accent-spruce-700"
                        aria-describedby={`${m.field}-hint`}
                      />
                      <span>
                        <span className="block font-medium">{m.label}</span>
                        <span id={`${m.field}-hint`} className="block text-sm text-ink-soft">
                          {m.hint}
                        </span>
                      </span>
                    </label>
                  </li>
                ))}
              </ul>
            </fieldset>
            <div className="mt-4">
              <SubmitButton>Save the mail choices</SubmitButton>
            </div>
          </Form>
        ) : null}
      </Section>

      <Section title="Where you are signed in">
        {message("revoke")}
        <ul className="divide-y divide-rule">
          {sessions.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
              <div className="min-w-56 flex-1 text-sm">
                {s.current ? (
                  <p className="text-xs font-semibold uppercase tracking-wider text-spruce-700">This browser</p>
                ) : null}
                <p className="font-medium">{s.browser}</p>
                <p className="text-ink-soft">
                  Signed in {when(s.createdAt)} · last seen {when(s.lastSeenAt)}
                  {s.ipAddress ? ` · from ${s.ipAddress}` : ""}
                </p>
              </div>
              <Form method="post">
                <input type="hidden" name="intent" value="revoke" />
                <input type="hidden" name="sessionId" value={s.id} />
                <SubmitButton tone="quiet">{s.current ? "Sign out here" : "Sign out that device"}</SubmitButton>
              </Form>
            </li>
          ))}
        </ul>
        <Form method="post" className="mt-4">
          <input type="hidden" name="intent" value="everywhere" />
          <SubmitButton tone="danger">Sign out everywhere</SubmitButton>
        </Form>
      </Section>

      <Section title="Failed attempts">
        {failed.total === 0 ? (
          <p className="text-sm text-ink-soft">No wrong passwords were tried on your account in the last 30 days.</p>
        ) : (
          <>
            <p className="text-sm text-ink-soft">
              {failed.total} failed attempt{failed.total === 1 ? "" : "s"} in the last 30 days
              {failed.total > failed.attempts.length ? `; the newest ${failed.attempts.length}` : ""}. If they were not you,
              nobody got in, but a password used anywhere else is worth changing.
            </p>
            {failed.addresses.length > 1 ? (
              <p className="mt-2 text-sm">
                From {failed.addresses.map((a) => `${a.ipAddress} (${a.tries})`).join(", ")}
                {failed.addresses.length === 10 ? " and others" : ""}.
              </p>
            ) : null}
            <ul className="mt-3 divide-y divide-rule text-sm">
              {failed.attempts.map((a, i) => (
                <li key={`${a.createdAt}-${i}`} className="py-2">
                  <p className="font-medium">{ATTEMPT_KINDS[a.kind] ?? a.kind}</p>
                  <p className="text-ink-soft">
                    {when(a.createdAt)} · from {a.ipAddress} · {a.browser}
                  </p>
                </li>
              ))}
            </ul>
          </>
        )}
      </Section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
