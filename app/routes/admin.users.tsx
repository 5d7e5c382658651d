import { Form } from "react-router";
import { Notice, SubmitButton } from "~/components/form";
import { failureOf } from "~/utils/forms";
import { ROLE_LABELS, ROLES } from "~/utils/vocab";
import { Pager } from "~/components/pager";
import type { Route } from "./+types/admin.users";
import { usersAction, usersLoader } from "./admin.users.server";

export const meta: Route.MetaFunction = () => [{ title: "Users · Admin · Torqueleaf" }, { name: "robots", content: "noindex" }];

export const loader = (args: Route.LoaderArgs) => usersLoader(args);
export const action = (args: Route.ActionArgs) => usersAction(args);

const input = "min-h-11 rounded-md border border-rule bg-paper px-3 py-2 text-sm";
/** Below the small breakpoint each row is a card: its cells stack, each with its own heading. */
const cell = "block px-4 py-2 sm:table-cell sm:py-3";
const cellLabel = "block text-xs font-semibold uppercase tracking-wider text-ink-soft sm:hidden";

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const { users, total, page, pageSize, query, adminId } = loaderData;
  const failure = failureOf(actionData);
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const pageLink = (n: number) => {
    const params = new URLSearchParams();
    if (query.q) params.set("q", query.q);
    if (query.role) params.set("role", query.role);
    params.set("page", String(n));
    return `?${params}`;
  };

  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <h1 className="font-serif text-3xl font-semibold sm:text-4xl tracking-tight text-spruce-900">Users and roles</h1>
      <p className="mt-2 text-ink-soft">
        New members are readers; readers become authors by accepting the contributor terms. Editors and admins are appointed here.
        Every change is kept in the audit log with your reason.
      </p>

      <Form method="get" role="search" aria-label="Find users" className="mt-6 flex flex-wrap items-end gap-3">
        <label className="min-w-0 text-sm">
          <span className="block font-semibold">Name or e-mail</span>
          <input name="q" type="search" defaultValue={query.q ?? ""} className={`mt-1 w-full sm:w-auto ${input}`} />
        </label>
        <label className="text-sm">
          <span className="block font-semibold">Role</span>
          <select name="role" defaultValue={query.role ?? ""} className={`mt-1 ${input}`}>
            <option value="">Any role</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        </label>
        <SubmitButton tone="quiet">Show</SubmitButton>
      </Form>

      <div className="mt-6">{failure ? <Notice tone="error">{failure.message}</Notice> : null}</div>
      <p className="text-sm text-ink-soft">{`${total} ${total === 1 ? "account" : "accounts"}`}</p>
      <div className="mt-3 overflow-x-auto rounded-xl border border-rule bg-white shadow-sm">
        <table className="block w-full text-left text-sm sm:table">
          <thead className="hidden bg-paper-deep text-xs uppercase tracking-wider text-ink-soft sm:table-header-group">
            <tr>
              <th className="px-4 py-3">Member</th>
              <th className="px-4 py-3">Role</th>
              <th className="px-4 py-3">Status</th>
              <th className="px-4 py-3">Change</th>
            </tr>
          </thead>
          <tbody className="block divide-y divide-rule sm:table-row-group">
            {users.map((u) => {
              const rowFailure = failure?.values?.userId === String(u.id) ? failure : null;
              return (
                <tr key={u.id} className="block py-2 align-top sm:table-row sm:py-0">
                  <td className={cell}>
                    <p className="font-medium">{u.name}</p>
                    <p className="break-words text-ink-soft">{u.email}</p>
                  </td>
                  <td className={cell}>
                    <span className={cellLabel}>Role</span>
                    {ROLE_LABELS[u.role]}
                  </td>
                  <td className={cell}>
                    <span className={cellLabel}>Status</span>
                    {u.disabledAt ? (
                      <span className="font-semibold text-z-danger">Disabled</span>
                    ) : u.emailVerifiedAt ? (
                      "Active"
                    ) : (
                      <span className="text-ink-soft">Address not confirmed</span>
                    )}
                  </td>
                  <td className={cell}>
                    <span className={cellLabel}>Change</span>
                    {u.id === adminId ? (
                      <span className="text-ink-soft">Your own account</span>
                    ) : (
                      <Form
                        method="post"
                        // A new key once the row changes, so the typed reason does not linger for the next change.
                        key={`${u.role}-${u.disabledAt ? 1 : 0}`}
                        className="flex flex-wrap items-start gap-2"
                        aria-label={`Change ${u.name}`}
                      >
                        <input type="hidden" name="userId" value={u.id} />
                        <select name="role" defaultValue={u.role} aria-label={`Role for ${u.name}`} className={input}>
                          {ROLES.map((r) => (
                            <option key={r} value={r}>
                              {ROLE_LABELS[r]}
                            </option>
                          ))}
                        </select>
                        <div className="w-full sm:w-auto">
                          <input
                            name="reason"
                            placeholder="Reason (kept in the audit log)"
                            aria-label={`Reason for the change to ${u.name}`}
                            defaultValue={rowFailure?.values?.reason}
                            aria-invalid={rowFailure?.fields?.reason ? true : undefined}
                            className={`${input} w-full sm:w-56`}
                          />
                          {rowFailure?.fields?.reason ? (
                            <p className="mt-1 text-xs font-medium text-z-danger">{rowFailure.fields.reason}</p>
                          ) : null}
                        </div>
                        <SubmitButton name="intent" value="set-role" tone="quiet">
                          Set role
                        </SubmitButton>
                        {u.disabledAt ? (
                          <SubmitButton name="intent" value="enable" tone="quiet">
                            Enable
                          </SubmitButton>
                        ) : (
                          <SubmitButton name="intent" value="disable" tone="danger">
                            Disable
                          </SubmitButton>
                        )}
                      </Form>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {users.length === 0 ? <p className="p-6 text-center text-ink-soft">No accounts match.</p> : null}
      </div>
      <Pager page={page} pages={pages} href={pageLink} className="mt-4" />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
