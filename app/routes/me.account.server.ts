import { data, redirect } from "react-router";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { revokeSession, revokeUserSessions } from "~/models/sessions.server";
import { updateUserName } from "~/models/users.server";
import { changePassword } from "~/services/auth/accounts.server";
import { fieldErrors, formValues, nameField } from "~/services/auth/fields.server";
import { runForm } from "~/services/auth/form-result.server";
import { requireUser } from "~/services/auth/guards.server";
import { expiredSessionCookie, getAuth } from "~/services/auth/session.server";
import { AppError } from "~/utils/errors";

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
  const values = formValues(await args.request.formData());
  return runForm(values, async () => {
    const parsed = intentSchema.safeParse(values);
    if (!parsed.success) throw new AppError(400, "invalid", "Some fields need attention.", fieldErrors(parsed.error));
    const db = await getDb();
    const input = parsed.data;
    switch (input.intent) {
      case "profile":
        await updateUserName(db, auth.user.id, input.name);
        return { ok: true as const, intent: input.intent, message: "Your name is saved." };
      case "password":
        await changePassword(args.request, auth.user, auth.sessionId, values);
        return {
          ok: true as const,
          intent: input.intent,
          message: "Your new password is set. Every other device was signed out.",
        };
      case "revoke": {
        if (input.sessionId === auth.sessionId) {
          await revokeSession(db, auth.sessionId, auth.user.id);
          return redirect("/login?notice=signed-out", { headers: { "Set-Cookie": await expiredSessionCookie() } });
        }
        const ended = await revokeSession(db, input.sessionId, auth.user.id);
        if (!ended)
          return data({ ok: false as const, intent: input.intent, message: "That session had already ended." }, { status: 404 });
        return { ok: true as const, intent: input.intent, message: "That device is signed out." };
      }
      case "everywhere":
        await revokeUserSessions(db, auth.user.id);
        return redirect("/login?notice=everywhere", { headers: { "Set-Cookie": await expiredSessionCookie() } });
    }
  });
}
