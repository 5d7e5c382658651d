import { data, redirect } from "react-router";
import { z } from "zod";
import { getDb } from "~/db/client.server";
import { CHECKLIST_LIMITS, idParam } from "~/models/checklist-input";
import {
  addOwnItem,
  deleteChecklist,
  deleteItem,
  mergeLatestRevision,
  ownChecklist,
  patchItem,
} from "~/models/checklists.server";
import { requireUser } from "~/services/auth/guards.server";
import { notFound } from "~/utils/errors";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";
import { forPage } from "~/utils/http.server";

/**
 * The checklist page's changes, one form each, told apart by `intent`. A plain form post (no
 * JavaScript) is answered with a redirect back to the page; the page's fetchers send `via=fetcher`
 * and get `{ ok: true }`, so the page stays where it is while its data revalidates.
 */

const itemId = z.coerce
  .number({ error: "itemId: pick an item" })
  .int("itemId: pick an item")
  .positive("itemId: pick an item")
  .max(2 ** 31);
const quantity = z.coerce
  .number({ error: "quantity: give a whole number" })
  .int("quantity: give a whole number")
  .min(1, "quantity: at least 1")
  .max(CHECKLIST_LIMITS.quantity, `quantity: at most ${CHECKLIST_LIMITS.quantity}`);
const via = z.enum(["fetcher"]).optional();

export const checklistFormSchema = z.discriminatedUnion(
  "intent",
  [
    z.object({ intent: z.literal("tick"), itemId, checked: z.enum(["true", "false"], { error: "checked: true or false" }), via }),
    z.object({
      intent: z.literal("item"),
      itemId,
      quantity,
      note: z.string().trim().max(CHECKLIST_LIMITS.note, `note: at most ${CHECKLIST_LIMITS.note} characters`),
      via,
    }),
    z.object({
      intent: z.literal("add"),
      name: z
        .string()
        .trim()
        .min(1, "name: give the item a name")
        .max(CHECKLIST_LIMITS.name, `name: at most ${CHECKLIST_LIMITS.name} characters`),
      quantity,
      via,
    }),
    z.object({ intent: z.literal("remove"), itemId, via }),
    z.object({ intent: z.literal("merge"), via }),
    z.object({ intent: z.literal("delete"), via }),
  ],
  { error: "intent: this form does not exist" },
);

export async function checklistAction(args: { request: Request; params: { id?: string }; context?: unknown }) {
  const user = await requireUser(args);
  const db = await getDb();
  const id = await forPage(async () => {
    const id = idParam(args.params.id);
    if (id === null) throw notFound("This checklist");
    // The owner is checked before the form is read: a stranger learns nothing from field errors.
    await ownChecklist(db, user, id);
    return id;
  });
  const page = `/me/checklists/${id}`;
  return handleForm(args.request, checklistFormSchema, async (input) => {
    const done = (text: string | null) =>
      input.via === "fetcher"
        ? data({ ok: true as const, text })
        : text
          ? redirectWithFlash(page, { tone: "success", text })
          : redirect(page);
    switch (input.intent) {
      case "tick":
        await patchItem(db, user, id, input.itemId, { checked: input.checked === "true" });
        return done(null);
      case "item":
        await patchItem(db, user, id, input.itemId, { quantity: input.quantity, note: input.note || null });
        return done(null);
      case "add":
        await addOwnItem(db, user, id, { name: input.name, quantity: input.quantity });
        return done(null);
      case "remove":
        await deleteItem(db, user, id, input.itemId);
        return done(null);
      case "merge": {
        const merged = await mergeLatestRevision(db, user, id);
        const plural = (n: number) => (n === 1 ? "" : "s");
        return done(
          `Merged revision ${merged.revisionNumber}: ${merged.added} item${plural(merged.added)} added, ${merged.removed} marked as no longer in the guide. Your ticks, quantities, notes and own items are kept.`,
        );
      }
      case "delete":
        await deleteChecklist(db, user, id);
        return redirectWithFlash("/me/checklists", { tone: "success", text: "The checklist is deleted." });
    }
  });
}
