import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { Link, useRevalidator } from "react-router";
import { GuideHistory } from "~/components/audit-list";
import { ConflictView } from "~/components/authoring/conflict-view";
import {
  addStep,
  duplicateStep,
  type EditorDraft,
  type EditorPhoto,
  moveStep,
  removeStep,
  updateStep,
} from "~/components/authoring/draft-state";
import { forgetKept, type KeptDraft, readKept, type SaveState, useAutosave } from "~/components/authoring/autosave";
import { StepPhotos } from "~/components/authoring/photo-uploads";
import { StepBodyEditor } from "~/components/authoring/step-body-editor";
import { CalloutListEditor } from "~/components/editor/callout-editor";
import { fieldId, focusField } from "~/components/editor/field-paths";
import { FindingsPanel } from "~/components/editor/findings-panel";
import { FitmentMatrixEditor } from "~/components/editor/fitment-matrix";
import { PartsEditor, ToolsEditor } from "~/components/editor/parts-tools";
import { EditorSafetyNotice } from "~/components/editor/safety-notice";
import { getDb } from "~/db/client.server";
import { calloutSchema } from "~/engine/callouts";
import { type Finding, fittingPowertrains, runSafetyRules } from "~/engine/rules";
import { listAudit } from "~/models/audit.server";
import { offeredForFitment, publicCatalogue } from "~/models/catalogue.server";
import { readDraft } from "~/models/drafts.server";
import { readCatalogue } from "~/models/reader-cache.server";
import { commentsForDraft } from "~/models/review.server";
import { requireUser } from "~/services/auth/guards.server";
import { forPage } from "~/utils/http.server";
import { formatDateTime } from "~/utils/format";
import { CATEGORIES, CATEGORY_LABELS, DIFFICULTY_LABELS } from "~/utils/vocab";
import type { Route } from "./+types/workbench.guide";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.view.draft.title ?? "Guide"} · Workbench · Torqueleaf` },
  { name: "robots", content: "noindex" },
];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const guideId = Number(args.params.id);
  return forPage(async () => {
    const db = await getDb();
    const view = await readDraft(db, user, Number.isSafeInteger(guideId) && guideId > 0 ? guideId : -1);
    const makes = await readCatalogue(db);
    const catalogue = offeredForFitment(publicCatalogue(makes), view.draft.fitment);
    const reviewComments = await commentsForDraft(db, view.guide.id, view.revision.number);
    const history = (await listAudit(db, { guideId: view.guide.id }, 50)).entries;
    return { view, catalogue, mine: view.guide.authorId === user.id, reviewComments, history };
  });
}

type Catalogue = Route.ComponentProps["loaderData"]["catalogue"];

const input = "mt-1.5 min-h-11 w-full rounded-md border bg-paper px-3 py-2";
const smallButton =
  "inline-flex min-h-11 min-w-11 items-center justify-center rounded-md border border-rule bg-white px-3 text-sm font-semibold text-spruce-800 hover:bg-paper-deep disabled:opacity-40";

/** The field a message names, or the section it belongs to when that field is not on screen. */
function jumpTo(path: string) {
  if (focusField(path)) return;
  document.getElementById(`section-${path.split(".")[0]}`)?.scrollIntoView({ block: "start" });
}

function SaveStatus({ state }: { state: SaveState }) {
  const [text, tone] = ((): [string, string] => {
    switch (state.kind) {
      case "saved":
        return [
          state.at ? `saved ${formatDateTime(state.at).split(", ").at(-1)?.replace(" UTC", "")}` : "all saved",
          "bg-spruce-50 text-spruce-900",
        ];
      case "saving":
        return ["saving…", "bg-paper-deep text-ink"];
      case "retrying":
        return [`not saved — retrying (${state.message})`, "bg-z-warning/15 text-ink"];
      case "offline":
        return ["offline — kept on this device", "bg-brass-100 text-spruce-900"];
      case "invalid":
        return [
          `not saved — ${Object.keys(state.fields).length || "some"} field(s) need attention; kept on this device`,
          "bg-z-danger/10 text-z-danger",
        ];
      case "conflict":
        return ["not saved — changed elsewhere", "bg-z-warning/15 text-ink"];
      case "frozen":
        return [state.message, "bg-paper-deep text-ink"];
    }
  })();
  return (
    <p
      role="status"
      aria-live="polite"
      data-save-state={state.kind}
      className={`rounded-full px-3 py-1 text-sm font-semibold ${tone}`}
    >
      {text}
    </p>
  );
}

/** The engine's findings on the draft as typed, with callouts not yet complete standing aside. */
function liveFindings(draft: EditorDraft, catalogue: Catalogue): Finding[] {
  const powertrains = new Map(
    catalogue.flatMap((m) =>
      m.models.flatMap((mo) => mo.generations.flatMap((g) => g.variants.map((v) => [v.id, v.powertrain]))),
    ),
  );
  const steps = draft.steps.map((s) => ({
    title: s.title,
    liftsVehicle: s.liftsVehicle,
    disconnectsBattery: s.disconnectsBattery,
    // An unfinished callout keeps its place (findings name callouts by position) but says nothing yet.
    callouts: s.callouts.map((c) => {
      const parsed = calloutSchema.safeParse(c);
      return parsed.success ? parsed.data : { kind: "tip" as const, text: "" };
    }),
  }));
  const fitmentPowertrains = fittingPowertrains(
    draft.fitment.map((f) => ({ status: f.status, powertrain: powertrains.get(f.variantId) })),
  );
  try {
    return runSafetyRules({ steps, fitmentPowertrains });
  } catch {
    return [];
  }
}

type SubmitProblem = { message: string; fields: Record<string, string> };

function SubmitPanel({
  guideId,
  published,
  blocked,
  onSubmitted,
}: {
  guideId: number;
  published: boolean;
  blocked: boolean;
  onSubmitted: () => void;
}) {
  const [summary, setSummary] = useState("");
  const [problem, setProblem] = useState<SubmitProblem | null>(null);
  const [busy, setBusy] = useState(false);
  const submit = async () => {
    setBusy(true);
    setProblem(null);
    try {
      const response = await fetch(`/api/guides/${guideId}/submit`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ changeSummary: summary }),
      });
      const body = await response.json().catch(() => ({}));
      if (response.ok) onSubmitted();
      else
        setProblem({
          message: body.error?.message ?? `The server answered ${response.status}.`,
          fields: body.error?.fields ?? {},
        });
    } catch {
      setProblem({ message: "The server could not be reached: your draft is kept; try again when you are online.", fields: {} });
    } finally {
      setBusy(false);
    }
  };
  return (
    <section id="section-submit" aria-labelledby="submit-title" className="rounded-xl border border-rule bg-white p-4 shadow-sm">
      <h2 id="submit-title" className="font-serif text-xl font-semibold text-spruce-900">
        Submit for review
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        An editor checks the safety content before readers see it. The revision cannot be edited while they review it.
      </p>
      <label htmlFor="field-changeSummary" className="mt-3 block text-sm font-semibold">
        What changed{published ? "" : " (optional for a first revision)"}
      </label>
      <textarea
        id="field-changeSummary"
        rows={2}
        maxLength={500}
        value={summary}
        onChange={(e) => setSummary(e.target.value)}
        className={`${input} ${problem?.fields.changeSummary ? "border-z-danger" : "border-rule"}`}
        aria-invalid={problem?.fields.changeSummary ? true : undefined}
      />
      <button
        type="button"
        onClick={submit}
        disabled={busy || blocked}
        className="mt-3 min-h-11 w-full rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700 disabled:opacity-50"
      >
        {busy ? "Submitting…" : "Submit for review"}
      </button>
      {blocked ? <p className="mt-2 text-sm text-ink-soft">Save your changes first (see the status at the top).</p> : null}
      {problem ? (
        <div role="alert" className="mt-3 rounded-md border-l-4 border-z-danger bg-white p-3 text-sm">
          <p className="font-semibold">{problem.message}</p>
          {Object.keys(problem.fields).length ? (
            <ul className="mt-2 list-disc space-y-1 pl-5">
              {Object.entries(problem.fields).map(([path, message]) => (
                <li key={path}>
                  <button type="button" className="text-left text-spruce-700 underline" onClick={() => jumpTo(path)}>
                    {message}
                  </button>
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}

function RestoreOffer({ kept, onRestore, onDiscard }: { kept: KeptDraft; onRestore: () => void; onDiscard: () => void }) {
  return (
    <div role="alert" className="mb-6 rounded-xl border-l-4 border-brass-500 bg-brass-50 p-4">
      <p className="font-semibold">
        Changes from {formatDateTime(kept.keptAt)} were kept on this device but never reached the server.
      </p>
      <p className="mt-1 text-sm">Restore them to go on where you left off (they are then saved), or discard them.</p>
      <div className="mt-3 flex flex-wrap gap-2">
        <button
          type="button"
          onClick={onRestore}
          className="min-h-11 rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper"
        >
          Restore my changes
        </button>
        <button type="button" onClick={onDiscard} className={smallButton}>
          Discard them
        </button>
      </div>
    </div>
  );
}

function StepCard({
  index,
  count,
  step,
  errors,
  onChange,
  onPhotos,
  onMove,
  onDuplicate,
  onRemove,
}: {
  index: number;
  count: number;
  step: EditorDraft["steps"][number];
  errors: Record<string, string>;
  onChange: (index: number, change: Partial<EditorDraft["steps"][number]>) => void;
  onPhotos: (index: number, update: (photos: EditorPhoto[]) => EditorPhoto[]) => void;
  onMove: (from: number, to: number) => void;
  onDuplicate: (index: number) => void;
  onRemove: (index: number) => void;
}) {
  const path = `steps.${index}`;
  const titleError = errors[`${path}.title`];
  const photos = useCallback((update: (photos: EditorPhoto[]) => EditorPhoto[]) => onPhotos(index, update), [index, onPhotos]);
  return (
    <li id={fieldId(path)} tabIndex={-1} className="scroll-mt-24 rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="font-mono text-base font-semibold text-brass-700">Step {index + 1}</h3>
        <fieldset className="flex flex-wrap gap-1">
          <legend className="sr-only">Step {index + 1}: order</legend>
          <button
            type="button"
            className={smallButton}
            disabled={index === 0}
            onClick={() => onMove(index, index - 1)}
            aria-keyshortcuts="Alt+ArrowUp"
            title="Move up (Alt+↑ in the step title)"
          >
            ↑<span className="sr-only"> Move step {index + 1} up</span>
          </button>
          <button
            type="button"
            className={smallButton}
            disabled={index === count - 1}
            onClick={() => onMove(index, index + 1)}
            aria-keyshortcuts="Alt+ArrowDown"
            title="Move down (Alt+↓ in the step title)"
          >
            ↓<span className="sr-only"> Move step {index + 1} down</span>
          </button>
          <button type="button" className={smallButton} onClick={() => onDuplicate(index)}>
            Duplicate<span className="sr-only"> step {index + 1}</span>
          </button>
          <button
            type="button"
            className={smallButton}
            onClick={() => {
              if (window.confirm(`Remove step ${index + 1}${step.title ? ` "${step.title}"` : ""} with its photos and callouts?`))
                onRemove(index);
            }}
          >
            Remove<span className="sr-only"> step {index + 1}</span>
          </button>
        </fieldset>
      </div>
      <label htmlFor={fieldId(`${path}.title`)} className="mt-3 block text-sm font-semibold">
        Step title
      </label>
      <input
        id={fieldId(`${path}.title`)}
        value={step.title}
        maxLength={160}
        onChange={(e) => onChange(index, { title: e.target.value })}
        onKeyDown={(e) => {
          if (e.altKey && (e.key === "ArrowUp" || e.key === "ArrowDown")) {
            e.preventDefault();
            const to = index + (e.key === "ArrowUp" ? -1 : 1);
            if (to >= 0 && to < count) {
              onMove(index, to);
              requestAnimationFrame(() => document.getElementById(fieldId(`steps.${to}.title`))?.focus());
            }
          }
        }}
        aria-invalid={titleError ? true : undefined}
        aria-describedby={titleError ? `${fieldId(`${path}.title`)}-error` : undefined}
        className={`${input} ${titleError ? "border-z-danger" : "border-rule"}`}
      />
      {titleError ? (
        <p id={`${fieldId(`${path}.title`)}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {titleError}
        </p>
      ) : null}
      <p className="mt-4 mb-1.5 text-sm font-semibold">What to do</p>
      <StepBodyEditor
        id={fieldId(`${path}.body`)}
        label={`Step ${index + 1} text`}
        value={step.body}
        onChange={(body) => onChange(index, { body })}
        error={errors[`${path}.body`]}
      />
      <fieldset className="mt-4 flex flex-wrap gap-x-6 gap-y-2">
        <legend className="sr-only">Step {index + 1}: safety flags</legend>
        <label className="flex min-h-11 items-center gap-2">
          <input
            type="checkbox"
            className="h-5 w-5"
            checked={step.liftsVehicle}
            onChange={(e) => onChange(index, { liftsVehicle: e.target.checked })}
          />
          Lifts the vehicle
        </label>
        <label className="flex min-h-11 items-center gap-2">
          <input
            type="checkbox"
            className="h-5 w-5"
            checked={step.disconnectsBattery}
            onChange={(e) => onChange(index, { disconnectsBattery: e.target.checked })}
          />
          Disconnects the battery
        </label>
      </fieldset>
      <StepPhotos path={`${path}.photos`} photos={step.photos} onChange={photos} errors={errors} />
      <div className="mt-4">
        <CalloutListEditor
          callouts={step.callouts}
          onChange={(callouts) => onChange(index, { callouts })}
          path={`${path}.callouts`}
          errors={errors}
          stepFlags={{ liftsVehicle: step.liftsVehicle, disconnectsBattery: step.disconnectsBattery }}
        />
      </div>
    </li>
  );
}

export default function GuideEditor({ loaderData }: Route.ComponentProps) {
  const { view, catalogue, mine, history } = loaderData;
  const guideId = view.guide.id;
  const editable = mine && view.revision.state === "draft";
  const revalidator = useRevalidator();
  const [draft, setDraft] = useState<EditorDraft>(() => view.draft as EditorDraft);
  // Bumped when the whole draft is replaced (restore, merge), so the text editors start afresh.
  const [generation, setGeneration] = useState(0);
  const [kept, setKept] = useState<KeptDraft | null>(null);
  const [serverFindings, setServerFindings] = useState<unknown[]>(view.findings ?? []);
  const autosave = useAutosave({ guideId, draft, initialVersion: view.draft.version, editable, onFindings: setServerFindings });
  const findings = useMemo(() => liveFindings(draft, catalogue), [draft, catalogue]);
  const errors = autosave.state.kind === "invalid" ? autosave.state.fields : {};

  // Work kept on this device from an earlier visit is offered back, unless it matches the server's.
  const checked = useRef(false);
  useEffect(() => {
    if (checked.current || !editable) return;
    checked.current = true;
    void readKept(guideId).then((found) => {
      if (!found) return;
      if (JSON.stringify(found.draft) === JSON.stringify(view.draft)) void forgetKept(guideId);
      else setKept(found);
    });
  }, [guideId, editable, view.draft]);

  const replace = (next: EditorDraft) => {
    setDraft(next);
    setGeneration((g) => g + 1);
  };
  const change = (fn: (d: EditorDraft) => EditorDraft) => setDraft((d) => fn(d));
  const onStep = useCallback(
    (index: number, c: Partial<EditorDraft["steps"][number]>) => setDraft((d) => updateStep(d, index, c)),
    [],
  );
  const onPhotos = useCallback(
    (index: number, update: (photos: EditorPhoto[]) => EditorPhoto[]) =>
      setDraft((d) => updateStep(d, index, { photos: update(d.steps[index]?.photos ?? []) })),
    [],
  );
  const field = (key: "title" | "summary" | "minutes") => errors[key];
  const conflict = autosave.state.kind === "conflict" ? autosave.state : null;

  if (!editable) {
    return (
      <div className="mx-auto max-w-3xl px-4 py-10 sm:px-6">
        <p className="text-sm">
          <Link to="/workbench" className="text-spruce-700 underline">
            ← Workbench
          </Link>
        </p>
        <h1 className="mt-2 font-serif text-3xl font-semibold text-spruce-900">{view.draft.title}</h1>
        <div className="mt-4 rounded-xl border-l-4 border-brass-500 bg-brass-50 p-4">
          {view.revision.state === "in-review" ? (
            <p>
              Revision {view.revision.number} is with the editors. It cannot be edited while they review it; if they ask for
              changes, a new draft opens here with their note.
            </p>
          ) : mine ? (
            <p>
              Revision {view.revision.number} cannot be edited ({view.revision.state}).
            </p>
          ) : (
            <p>This is another author's draft: you can read it, not change it.</p>
          )}
        </div>
        <p className="mt-4">
          <Link to={`/workbench/guides/${guideId}/preview`} className="text-spruce-700 underline">
            See it as readers will
          </Link>
        </p>
        <div className="mt-6">
          <GuideHistory entries={history} />
        </div>
      </div>
    );
  }

  return (
    <div className="mx-auto max-w-7xl px-4 py-6 sm:px-6">
      <div className="sticky top-0 z-10 -mx-4 mb-6 flex flex-wrap items-center justify-between gap-3 border-b border-rule bg-paper/95 px-4 py-3 backdrop-blur sm:-mx-6 sm:px-6">
        <div className="min-w-0">
          <p className="text-sm">
            <Link to="/workbench" className="text-spruce-700 underline">
              ← Workbench
            </Link>{" "}
            <span className="text-ink-soft">· revision {view.revision.number}, draft</span>
          </p>
          <h1 className="truncate font-serif text-2xl font-semibold text-spruce-900">{draft.title || "Untitled guide"}</h1>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <SaveStatus state={autosave.state} />
          <Link to={`/workbench/guides/${guideId}/preview`} target="_blank" rel="noopener" className={smallButton}>
            Preview
          </Link>
          <a href={`/api/guides/${guideId}/export?format=markdown`} className={smallButton} download>
            Export Markdown
          </a>
          <a href={`/api/guides/${guideId}/export?format=json`} className={smallButton} download>
            Export JSON
          </a>
        </div>
      </div>

      {view.reviewNote ? (
        <div className="mb-6 rounded-xl border-l-4 border-z-warning bg-white p-4 shadow-sm">
          <p className="font-semibold">The editor asked for changes:</p>
          <p className="mt-1 whitespace-pre-wrap">{view.reviewNote}</p>
          {loaderData.reviewComments.length ? (
            <ul aria-label="The editor's comments" className="mt-3 space-y-1 border-t border-rule pt-3 text-sm">
              {loaderData.reviewComments.map((c) => (
                <li key={c.id} className="whitespace-pre-wrap">
                  <span className="font-semibold">{c.stepIndex === null ? "Whole guide" : `Step ${c.stepIndex + 1}`}:</span>{" "}
                  {c.body}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
      {kept ? (
        <RestoreOffer
          kept={kept}
          onRestore={() => {
            replace(kept.draft);
            setKept(null);
          }}
          onDiscard={() => {
            void forgetKept(guideId);
            setKept(null);
          }}
        />
      ) : null}
      {conflict ? (
        <div className="mb-6">
          <ConflictView
            mine={draft}
            theirs={conflict.theirs}
            onResolve={(merged) => {
              replace(merged);
              autosave.resolve(merged, conflict.theirsVersion);
            }}
          />
        </div>
      ) : null}
      {autosave.state.kind === "invalid" ? (
        <div role="alert" className="mb-6 rounded-xl border-l-4 border-z-danger bg-white p-4 shadow-sm">
          <p className="font-semibold">{autosave.state.message} Your changes are kept on this device until they can be saved.</p>
          <ul className="mt-2 list-disc space-y-1 pl-5 text-sm">
            {Object.entries(autosave.state.fields).map(([path, message]) => (
              <li key={path}>
                <button type="button" className="text-left text-spruce-700 underline" onClick={() => jumpTo(path)}>
                  {path.replace(/^steps\.(\d+)/, (_, n) => `Step ${Number(n) + 1}`)}: {message}
                </button>
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      <div className="grid gap-8 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-8" key={generation}>
          <section
            id="section-details"
            aria-labelledby="details-title"
            className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5"
          >
            <h2 id="details-title" className="font-serif text-2xl font-semibold text-spruce-900">
              The guide
            </h2>
            <label htmlFor="field-title" className="mt-3 block text-sm font-semibold">
              Title
            </label>
            <input
              id="field-title"
              value={draft.title}
              maxLength={140}
              onChange={(e) => change((d) => ({ ...d, title: e.target.value }))}
              aria-invalid={field("title") ? true : undefined}
              className={`${input} ${field("title") ? "border-z-danger" : "border-rule"}`}
            />
            {field("title") ? <p className="mt-1 text-sm font-medium text-z-danger">{field("title")}</p> : null}
            <label htmlFor="field-summary" className="mt-4 block text-sm font-semibold">
              Summary
            </label>
            <textarea
              id="field-summary"
              rows={3}
              maxLength={600}
              value={draft.summary}
              onChange={(e) => change((d) => ({ ...d, summary: e.target.value }))}
              aria-invalid={field("summary") ? true : undefined}
              className={`${input} ${field("summary") ? "border-z-danger" : "border-rule"}`}
            />
            {field("summary") ? <p className="mt-1 text-sm font-medium text-z-danger">{field("summary")}</p> : null}
            <div className="mt-4 grid gap-4 sm:grid-cols-3">
              <div>
                <label htmlFor="field-category" className="block text-sm font-semibold">
                  Category
                </label>
                <select
                  id="field-category"
                  value={draft.category}
                  onChange={(e) => change((d) => ({ ...d, category: e.target.value }))}
                  className={`${input} border-rule`}
                >
                  {CATEGORIES.map((c) => (
                    <option key={c} value={c}>
                      {CATEGORY_LABELS[c]}
                    </option>
                  ))}
                </select>
              </div>
              <div>
                <label htmlFor="field-difficulty" className="block text-sm font-semibold">
                  Difficulty
                </label>
                <select
                  id="field-difficulty"
                  value={draft.difficulty}
                  onChange={(e) => change((d) => ({ ...d, difficulty: Number(e.target.value) }))}
                  className={`${input} border-rule`}
                >
                  {[1, 2, 3, 4, 5].map((n) => (
                    <option key={n} value={n}>
                      {n} · {DIFFICULTY_LABELS[n]}
                    </option>
                  ))}
                </select>
              </div>
              <div>
                <label htmlFor="field-minutes" className="block text-sm font-semibold">
                  Time (minutes)
                </label>
                <input
                  id="field-minutes"
                  type="number"
                  inputMode="numeric"
                  min={5}
                  max={4320}
                  value={Number.isFinite(draft.minutes) ? draft.minutes : ""}
                  onChange={(e) =>
                    change((d) => ({ ...d, minutes: e.target.value === "" ? Number.NaN : Number(e.target.value) }))
                  }
                  aria-invalid={field("minutes") ? true : undefined}
                  className={`${input} ${field("minutes") ? "border-z-danger" : "border-rule"}`}
                />
                {field("minutes") ? <p className="mt-1 text-sm font-medium text-z-danger">{field("minutes")}</p> : null}
              </div>
            </div>
          </section>

          <section
            id="section-fitment"
            aria-labelledby="fitment-title"
            className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5"
          >
            <h2 id="fitment-title" className="font-serif text-2xl font-semibold text-spruce-900">
              Fitment
            </h2>
            <p className="mt-1 text-sm text-ink-soft">
              Which vehicles this install fits. Readers filter the Library by these rows.
            </p>
            <div className="mt-3">
              <FitmentMatrixEditor
                catalogue={catalogue}
                value={draft.fitment}
                onChange={(fitment) => change((d) => ({ ...d, fitment }))}
                path="fitment"
                errors={errors}
              />
            </div>
          </section>

          <section id="section-steps" aria-labelledby="steps-title">
            <h2 id="steps-title" className="font-serif text-2xl font-semibold text-spruce-900">
              Steps
            </h2>
            <div className="mt-3">
              <EditorSafetyNotice />
            </div>
            {draft.steps.length === 0 ? <p className="mt-3 text-ink-soft">No steps yet.</p> : null}
            <ol className="mt-4 space-y-6">
              {draft.steps.map((step, index) => (
                <StepCard
                  // Steps have no ids of their own in a draft; position and generation keep each editor with its step.
                  key={`${generation}-${index}-${draft.steps.length}`}
                  index={index}
                  count={draft.steps.length}
                  step={step}
                  errors={errors}
                  onChange={onStep}
                  onPhotos={onPhotos}
                  onMove={(from, to) => {
                    change((d) => moveStep(d, from, to));
                    setGeneration((g) => g + 1);
                  }}
                  onDuplicate={(i) => {
                    change((d) => duplicateStep(d, i));
                    setGeneration((g) => g + 1);
                  }}
                  onRemove={(i) => {
                    change((d) => removeStep(d, i));
                    setGeneration((g) => g + 1);
                  }}
                />
              ))}
            </ol>
            <button
              type="button"
              className="mt-4 min-h-11 rounded-md border-2 border-dashed border-spruce-600 px-4 py-2 font-semibold text-spruce-800 hover:bg-spruce-50"
              onClick={() => {
                change((d) => addStep(d));
                requestAnimationFrame(() => document.getElementById(fieldId(`steps.${draft.steps.length}.title`))?.focus());
              }}
            >
              Add a step
            </button>
          </section>

          <section
            id="section-parts"
            aria-labelledby="parts-title"
            className="rounded-xl border border-rule bg-white p-4 shadow-sm sm:p-5"
          >
            <h2 id="parts-title" className="font-serif text-2xl font-semibold text-spruce-900">
              Parts and tools
            </h2>
            <div className="mt-3">
              <PartsEditor
                parts={draft.parts}
                onChange={(parts) => change((d) => ({ ...d, parts }))}
                stepTitles={draft.steps.map((s, i) => s.title || `Step ${i + 1}`)}
                path="parts"
                errors={errors}
              />
            </div>
            <div className="mt-6">
              <ToolsEditor
                tools={draft.tools}
                onChange={(tools) => change((d) => ({ ...d, tools }))}
                path="tools"
                errors={errors}
              />
            </div>
          </section>
        </div>

        <aside className="space-y-6 lg:sticky lg:top-24 lg:self-start" aria-label="Safety findings and submission">
          <div>
            <FindingsPanel findings={findings} onJump={jumpTo} />
            {serverFindings.length !== findings.length ? (
              <p className="mt-2 text-xs text-ink-soft">
                Counted as you type; the last saved copy had {serverFindings.length} finding(s).
              </p>
            ) : null}
          </div>
          <SubmitPanel
            guideId={guideId}
            published={!!view.guide.publishedRevisionId}
            blocked={autosave.state.kind !== "saved"}
            onSubmitted={() => {
              void forgetKept(guideId);
              revalidator.revalidate();
            }}
          />
          <GuideHistory entries={history} />
        </aside>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/error-page";
