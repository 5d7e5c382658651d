import { redirect } from "react-router";
import { getDb } from "~/db/client.server";
import { createChecklistSchema } from "~/models/checklist-input";
import { createChecklist } from "~/models/checklists.server";
import { getUser } from "~/services/auth/session.server";
import { handleForm, redirectWithFlash } from "~/utils/forms.server";

/**
 * "Save a parts checklist" from a guide page. Someone not signed in is sent to sign in and back to
 * the guide's parts (the guide page is the same for everyone, so the button is there for them too).
 */
export async function saveChecklistAction(args: { request: Request; context?: unknown }) {
  const user = await getUser(args);
  return handleForm(args.request, createChecklistSchema, async ({ guideSlug }) => {
    if (!user) {
      const back = `/guides/${encodeURIComponent(guideSlug)}#parts`;
      return redirect(`/login?redirectTo=${encodeURIComponent(back)}`);
    }
    const { id, created } = await createChecklist(await getDb(), user, guideSlug);
    return redirectWithFlash(`/me/checklists/${id}`, {
      tone: created ? "success" : "info",
      text: created
        ? "Saved: the guide's parts and tools are on your checklist. Tick them off as you buy them."
        : "You already have a checklist for this guide: here it is.",
    });
  });
}
