import { redirect } from "react-router";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { revokeSession, revokeUserSessions } from "~/models/sessions.server";
import { updateUserName } from "~/models/users.server";
import { changePassword } from "~/services/auth/accounts.server";
import { nameField } from "~/services/auth/fields.server";
import { requireUser } from "~/services/auth/guards.server";
import { expiredSessionCookie, getAuth } from "~/services/auth/session.server";
import { AppError } from "~/utils/errors";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";

const intentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("profile"), name: nameField }),
    z.object({ intent: z.literal("password") }),
    z.object({ intent: z.literal("revoke"), sessionId: z.string().regex(/^[0-9a-f]{64}$/, "Pick a session from the list.") }),
    z.object({ intent: z.literal("everywhere") }),
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
      case "everywhere":
        await revokeUserSessions(db, auth.user.id);
        return redirect("/login?notice=everywhere", { headers: { "Set-Cookie": await expiredSessionCookie() } });
    }
  });
}
