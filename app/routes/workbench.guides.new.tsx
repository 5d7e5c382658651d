import { Form, Link, redirect } from "react-router";
import { Field, Notice, SelectField, SubmitButton } from "~/components/form";
import { getDb } from "~/db/client.server";
import { createGuide } from "~/models/guides.server";
import { guideMetaSchema } from "~/models/guide-input";
import { requirePermission } from "~/services/auth/guards.server";
import { failureOf } from "~/utils/forms";
import { handleForm } from "~/utils/forms.server";
import { CATEGORIES, CATEGORY_LABELS, DIFFICULTY_LABELS } from "~/utils/vocab";
import type { Route } from "./+types/workbench.guides.new";

export const meta: Route.MetaFunction = () => [{ title: "New guide · Torqueleaf" }, { name: "robots", content: "noindex" }];

export async function loader(args: Route.LoaderArgs) {
  await requirePermission(args, "create:guide");
  return null;
}

export async function action(args: Route.ActionArgs) {
  const user = await requirePermission(args, "create:guide");
  return handleForm(args.request, guideMetaSchema, async (input) => {
    const created = await createGuide(await getDb(), user, input);
    return redirect(`/workbench/guides/${created.id}`);
  });
}

export default function NewGuide({ actionData }: Route.ComponentProps) {
  const failure = failureOf(actionData);
  const values = failure?.values ?? {};
  const fields = failure?.fields ?? {};
  return (
    <div className="mx-auto max-w-2xl px-4 py-10 sm:px-6">
      <p className="text-sm">
        <Link to="/workbench" className="text-spruce-700 underline">
          ← Workbench
        </Link>
      </p>
      <h1 className="mt-2 font-serif text-4xl font-semibold text-spruce-900">A new guide</h1>
      <p className="mt-2 text-ink-soft">
        Start with what the install is. Steps, photos, fitment and parts come next, in the editor; everything saves as you go.
      </p>
      <Form method="post" className="mt-6 rounded-xl border border-rule bg-white p-6 shadow-sm" noValidate>
        {failure ? (
          <Notice tone="error" focusOn={failure}>
            {failure.message}
          </Notice>
        ) : null}
        <Field
          label="Title"
          name="title"
          defaultValue={values.title}
          error={fields.title}
          hint="For example: Roof-rack crossbars on the second-generation wagon"
        />
        <div className="mt-4">
          <label htmlFor="field-summary" className="block text-sm font-semibold text-ink">
            Summary
          </label>
          <textarea
            id="field-summary"
            name="summary"
            rows={3}
            defaultValue={values.summary}
            aria-invalid={fields.summary ? true : undefined}
            aria-describedby={fields.summary ? "field-summary-error" : undefined}
            className={`mt-1.5 w-full rounded-md border bg-paper px-3 py-2 ${fields.summary ? "border-z-danger" : "border-rule"}`}
          />
          {fields.summary ? (
            <p id="field-summary-error" className="mt-1 text-sm font-medium text-z-danger">
              {fields.summary}
            </p>
          ) : null}
        </div>
        <div className="grid gap-x-4 sm:grid-cols-3">
          <SelectField
            name="category"
            label="Category"
            options={CATEGORIES.map((c) => [c, CATEGORY_LABELS[c]] as const)}
            defaultValue={values.category}
            error={fields.category}
          />
          <SelectField
            name="difficulty"
            label="Difficulty"
            options={[1, 2, 3, 4, 5].map((d) => [String(d), `${d} · ${DIFFICULTY_LABELS[d]}`] as const)}
            defaultValue={values.difficulty}
            error={fields.difficulty}
          />
          <Field label="Time (minutes)" name="minutes" type="number" defaultValue={values.minutes} error={fields.minutes} />
        </div>
        <div className="mt-6">
          <SubmitButton>Create the draft</SubmitButton>
        </div>
      </Form>
    </div>
  );
}
