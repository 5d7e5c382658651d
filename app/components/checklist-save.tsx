import { Form } from "react-router";

/**
 * "Save a parts checklist" beside a guide's parts: the same for every reader (the guide page is
 * kept for anonymous readers), so someone not signed in is sent to sign in and back by the action.
 */
export function SaveChecklistButton({ slug }: { slug: string }) {
  return (
    <Form method="post" action="/me/checklists" className="no-print mt-3">
      <input type="hidden" name="guideSlug" value={slug} />
      <button
        type="submit"
        className="inline-flex min-h-11 w-full items-center justify-center rounded-md border border-spruce-700 px-3 py-2 text-sm font-semibold text-spruce-800 hover:bg-spruce-50"
      >
        Save a parts checklist
      </button>
    </Form>
  );
}
