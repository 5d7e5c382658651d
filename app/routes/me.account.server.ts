import { redirect } from "react-router";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { mailOptOutsOf, saveMailPreferences } from "~/models/mail-preferences.server";
import { revokeSession, revokeUserSessions } from "~/models/sessions.server";
import { updateUserName } from "~/models/users.server";
import { changePassword } from "~/services/auth/accounts.server";
import { nameField } from "~/services/auth/fields.server";
import { requireUser } from "~/services/auth/guards.server";
import { expiredSessionCookie, getAuth } from "~/services/auth/session.server";
import { AppError } from "~/utils/errors";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";
import { mailKindsFor, OPTIONAL_MAIL_KINDS, type OptionalMailKind } from "~/utils/mail-kinds";
import type { Role } from "~/utils/vocab";

/** The form field of one kind's checkbox in the Mail section. */
export const mailField = (kind: OptionalMailKind) => `mail-${kind}`;

/** The kinds the Mail section lists: those that can reach this role, and any turned off already. */
export function mailKindsShown(role: Role, off: readonly OptionalMailKind[]): OptionalMailKind[] {
  const relevant = new Set([...mailKindsFor(role), ...off]);
  return OPTIONAL_MAIL_KINDS.filter((k) => relevant.has(k));
}

const tick = z.literal("on", { error: "A tick box sends “on” or nothing." }).optional();
const mailFields = Object.fromEntries(OPTIONAL_MAIL_KINDS.map((k) => [mailField(k), tick]));

const intentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("profile"), name: nameField }),
    z.object({ intent: z.literal("password") }),
    z.object({ intent: z.literal("revoke"), sessionId: z.string().regex(/^[0-9a-f]{64}$/, "Pick a session from the list.") }),
    z.object({ intent: z.literal("everywhere") }),
    z.object({ intent: z.literal("mail"), ...mailFields }),
  ],
  { error: "Choose one of the actions on this page." },
);

/** The account page's actions, one intent each; every change applies to the signed-in member only. */
export async function accountAction(args: { request: Request; context?: unknown }) {
  await requireUser(args);
  const auth = (await getAuth(args))!;
  return handleForm(args.request, intentSchema, async (input, values) => {
    const db = await getDb();
    switch (input.intent) {
      case "profile":
        await updateUserName(db, auth.user.id, input.name);
        return redirectWithFlash("/me/account", { tone: "success", text: "Your name is saved." });
      case "password":
        await changePassword(args.request, auth.user, auth.sessionId, values);
        return redirectWithFlash("/me/account", {
          tone: "success",
          text: "Your new password is set. Every other device was signed out.",
        });
      case "revoke": {
        if (input.sessionId === auth.sessionId) {
          await revokeSession(db, auth.sessionId, auth.user.id);
          return redirect("/login?notice=signed-out", { headers: { "Set-Cookie": await expiredSessionCookie() } });
        }
        const ended = await revokeSession(db, input.sessionId, auth.user.id);
        if (!ended) throw new AppError(404, "not-found", "That session had already ended.");
        return redirectWithFlash("/me/account", { tone: "success", text: "That device is signed out." });
      }
      case "mail": {
        const shown = mailKindsShown(auth.user.role, await mailOptOutsOf(db, auth.user.id));
        const ticked = input as Record<string, string | undefined>;
        const wanted = shown.filter((k) => ticked[mailField(k)] === "on");
        await saveMailPreferences(db, auth.user.id, shown, wanted);
        return redirectWithFlash("/me/account", { tone: "success", text: "Your mail choices are saved." });
      }
      case "everywhere":
        await revokeUserSessions(db, auth.user.id);
        return redirect("/login?notice=everywhere", { headers: { "Set-Cookie": await expiredSessionCookie() } });
    }
  });
}
