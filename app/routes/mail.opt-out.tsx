import { data, Form, Link } from "react-router";
import { z } from "zod";
import { AuthCard } from "~/components/auth-form";
import { Notice, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { mailOptOutsOf, optOutByLink } from "~/models/mail-preferences.server";
import { getUserById } from "~/models/users.server";
import { readOptOutToken } from "~/services/mail/opt-out-token.server";
import { failureOf } from "~/utils/forms";
import { formHeaders, handleForm } from "~/utils/forms.server";
import { MAIL_KIND_INFO } from "~/utils/mail-kinds";
import type { Route } from "./+types/mail.opt-out";

export const meta: Route.MetaFunction = () => [
  { title: "Turn off these mails · Torqueleaf" },
  { name: "robots", content: "noindex" },
];

/** "a…@example.test": enough for the owner to recognise, little for anyone the mail was forwarded to. */
const masked = (email: string) => {
  const at = email.lastIndexOf("@");
  return at > 0 ? `${email[0]}…${email.slice(at)}` : "…";
};

/** What the page shows: never the full address, the account id or the token's parts. */
type View = { state: "damaged" } | { state: "gone" } | { state: "on" | "off"; label: string; hint: string; address: string };
type Target = View & { userId?: number; kind?: keyof typeof MAIL_KIND_INFO };

/**
 * What the link in the mail is for. The token alone decides: it is signed for one account and one
 * kind, so it can only ever turn off that kind for that account, whoever is signed in (or nobody).
 */
async function targetOf(token: string): Promise<Target> {
  const read = readOptOutToken(token);
  if (!read) return { state: "damaged" };
  const db = await getDb();
  const user = await getUserById(db, read.userId);
  if (!user) return { state: "gone" };
  const off = (await mailOptOutsOf(db, user.id)).includes(read.kind);
  return {
    state: off ? "off" : "on",
    userId: user.id,
    kind: read.kind,
    ...MAIL_KIND_INFO[read.kind],
    address: masked(user.email),
  };
}

const STATUS = { damaged: 400, gone: 404, on: 200, off: 200 } as const;

/** Opening the link only shows the button: mail scanners open links too, and only a person (or their mail client's one-click POST) may decide. */
export async function loader({ params }: Route.LoaderArgs) {
  const target = await targetOf(params.token);
  return data(publicView(target), { status: STATUS[target.state] });
}

const publicView = (target: Target): View =>
  target.state === "on" || target.state === "off"
    ? { state: target.state, label: target.label, hint: target.hint, address: target.address }
    : { state: target.state };

/** RFC 8058 one-click: a mail client posts `List-Unsubscribe=One-Click`; the page's button posts nothing else. */
const oneClickSchema = z.object({ "List-Unsubscribe": z.literal("One-Click").optional() });

export const headers = formHeaders;

/**
 * Records the opt-out. Allowed without the same-origin check (see crossSiteMiddleware): a mail
 * client posts from its own servers or pages, and the signed token, not a session, is what
 * authorises it. No redirect: a one-click client expects its answer from this address.
 */
export async function action({ request, params }: Route.ActionArgs) {
  const target = await targetOf(params.token);
  const { userId, kind } = target;
  if (target.state === "damaged" || target.state === "gone" || !userId || !kind) {
    return data(publicView(target), { status: STATUS[target.state] });
  }
  return handleForm(request, oneClickSchema, async (input) => {
    const recorded = await optOutByLink(await getDb(), userId, kind, input["List-Unsubscribe"] ? "one-click" : "page");
    if (!recorded) return data<View>({ state: "gone" }, { status: 404 });
    return data(publicView({ ...target, state: "off" }));
  });
}

const settingsLink = (
  <Link to="/me/account#mail" className="text-spruce-700 underline">
    your account settings
  </Link>
);

export default function MailOptOut({ loaderData, actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  const view: View = actionData && !failure && "state" in actionData ? (actionData as View) : (loaderData as View);
  if (view.state === "damaged") {
    return (
      <AuthCard title="This link is damaged">
        <Notice tone="error">
          This opt-out link is incomplete or was changed, so it cannot say whose mail to turn off. Nothing was changed.
        </Notice>
        <p className="text-ink-soft">
          Copy the whole link from the mail again (mail programs sometimes break long links across lines), or sign in and choose
          which mails you get in {settingsLink}.
        </p>
      </AuthCard>
    );
  }
  if (view.state === "gone") {
    return (
      <AuthCard title="This account no longer exists">
        <p className="text-ink-soft">
          The account this mail was sent to has been closed, so it gets no more mail from Torqueleaf.
        </p>
      </AuthCard>
    );
  }
  if (view.state === "off") {
    return (
      <AuthCard title="These mails are off">
        <Notice tone="success">
          Mail to {view.address} about “{view.label}” is turned off.
        </Notice>
        <p className="text-ink-soft">
          Mail about your account itself (confirming your address, resetting or changing your password) still comes, as it must.
          To turn this back on, or to change other kinds, sign in and open {settingsLink}.
        </p>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Turn off these mails?" intro={`For ${view.address}, who gets mail about “${view.label}”.`}>
      {failure ? (
        <Notice tone="error" focusOn={actionData}>
          {failure.message}
        </Notice>
      ) : null}
      <p className="text-ink-soft">{view.hint} Other kinds of mail are not affected.</p>
      <Form method="post" className="mt-6">
        <SubmitButton>Turn off these mails</SubmitButton>
      </Form>
      <p className="mt-4 text-sm text-ink-soft">You can turn them back on at any time in {settingsLink}.</p>
    </AuthCard>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
