import { z } from "zod";
import { getDb } from "~/db/client.server";
import { changeRole, listUsers, setDisabled } from "~/models/users.server";
import { requirePermission } from "~/services/auth/guards.server";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";
import { ROLES } from "~/utils/vocab";

type Args = { request: Request; context?: unknown };

const querySchema = z.object({
  q: z.string().trim().max(100).optional().catch(undefined),
  role: z.enum(ROLES).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(10_000).catch(1),
});

export async function usersLoader(args: Args) {
  const admin = await requirePermission(args, "manage:users");
  const params = Object.fromEntries(new URL(args.request.url).searchParams);
  const query = querySchema.parse({ ...params, q: params.q || undefined, role: params.role || undefined });
  const result = await listUsers(await getDb(), query);
  return { ...result, query, adminId: admin.id };
}

const reason = z
  .string({ error: "Say why; the reason is kept in the audit log." })
  .trim()
  .min(3, "Say why in a few words; the reason is kept in the audit log.")
  .max(500, "Keep the reason under 500 characters.");
const userId = z.coerce.number({ error: "Pick an account from the list." }).int().positive("Pick an account from the list.");

const intentSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("set-role"), userId, role: z.enum(ROLES, { error: "Pick one of the four roles." }), reason }),
    z.object({ intent: z.literal("disable"), userId, reason }),
    z.object({ intent: z.literal("enable"), userId, reason }),
  ],
  { error: "Choose one of the actions on this page." },
);

/** Role changes and disabling, each written to the audit log with who, when and why; back to the same list after. */
export async function usersAction(args: Args) {
  const admin = await requirePermission(args, "manage:users");
  const back = new URL(args.request.url);
  const here = back.pathname + back.search;
  return handleForm(args.request, intentSchema, async (input) => {
    const db = await getDb();
    if (input.intent === "set-role") {
      const user = await changeRole(db, admin.id, input.userId, input.role, input.reason);
      const article = /^[aeiou]/.test(input.role) ? "an" : "a";
      return redirectWithFlash(here, { tone: "success", text: `${user.name} is now ${article} ${input.role}.` });
    }
    const user = await setDisabled(db, admin.id, input.userId, input.intent === "disable", input.reason);
    const text = input.intent === "disable" ? `${user.name} can no longer sign in.` : `${user.name} can sign in again.`;
    return redirectWithFlash(here, { tone: "success", text });
  });
}
