import { useState } from "react";
import {
  bodyText,
  type ConflictChoice,
  type ConflictField,
  differingFields,
  type EditorDraft,
  type EditorStep,
  fieldId,
  mergeDrafts,
} from "./draft-state";

const LABELS: Record<string, string> = {
  title: "Title",
  summary: "Summary",
  category: "Category",
  difficulty: "Difficulty",
  minutes: "Time (minutes)",
  fitment: "Fitment",
  parts: "Parts",
  tools: "Tools",
};

function stepText(step: EditorStep | undefined): string {
  if (!step) return "(no such step)";
  const flags = [step.liftsVehicle ? "lifts the vehicle" : "", step.disconnectsBattery ? "disconnects the battery" : ""].filter(
    Boolean,
  );
  return [
    step.title || "(untitled)",
    bodyText(step.body),
    `${step.photos.length} photo(s), ${step.callouts.length} callout(s)${flags.length ? `; ${flags.join(", ")}` : ""}`,
  ].join("\n");
}

function shown(draft: EditorDraft, field: ConflictField): string {
  if (field.key === "step") return stepText(draft.steps[field.index]);
  if (field.key === "fitment")
    return draft.fitment.map((f) => `variant ${f.variantId}: ${f.status}${f.note ? ` (${f.note})` : ""}`).join("\n") || "(none)";
  if (field.key === "parts")
    return draft.parts.map((p) => `${p.quantity} × ${p.name}${p.partNumber ? ` [${p.partNumber}]` : ""}`).join("\n") || "(none)";
  if (field.key === "tools") return draft.tools.map((t) => t.name).join("\n") || "(none)";
  return String(draft[field.key] ?? "");
}

const choiceButton =
  "min-h-11 rounded-md border px-3 py-2 text-sm font-semibold aria-pressed:border-spruce-800 aria-pressed:bg-spruce-800 aria-pressed:text-paper border-rule bg-white text-spruce-800";

/**
 * Two copies of the draft disagree: this tab's and the one saved from elsewhere. Each field that
 * differs shows both; the author keeps theirs, takes the server's or copies text across, and the
 * merged draft is saved on top of the server's version. Nothing is overwritten unseen.
 */
export function ConflictView({
  mine,
  theirs,
  onResolve,
}: {
  mine: EditorDraft;
  theirs: EditorDraft;
  onResolve: (merged: EditorDraft) => void;
}) {
  const fields = differingFields(mine, theirs);
  const [choices, setChoices] = useState<Record<string, ConflictChoice>>({});
  const [copied, setCopied] = useState<string | null>(null);
  const all = (choice: ConflictChoice) => setChoices(Object.fromEntries(fields.map((f) => [fieldId(f), choice])));
  return (
    <section aria-labelledby="conflict-title" className="rounded-xl border-2 border-z-warning bg-white p-5 shadow-sm">
      <h2 id="conflict-title" className="font-serif text-2xl font-semibold text-spruce-900">
        This draft was changed somewhere else
      </h2>
      <p className="mt-2 text-ink">
        Another tab or device saved this draft after this page last did. Nothing has been overwritten. For each difference below,
        keep yours or take the saved one, then save the result.
      </p>
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className={choiceButton} onClick={() => all("mine")}>
          Keep all of mine
        </button>
        <button type="button" className={choiceButton} onClick={() => all("theirs")}>
          Take all of the saved copy
        </button>
      </div>
      <ul className="mt-4 space-y-4">
        {fields.map((field) => {
          const id = fieldId(field);
          const label = field.key === "step" ? `Step ${field.index + 1}` : LABELS[field.key];
          const choice = choices[id] ?? "mine";
          const theirText = shown(theirs, field);
          return (
            <li key={id} className="rounded-lg border border-rule p-3" data-conflict-field={id}>
              <h3 className="font-semibold">{label}</h3>
              <div className="mt-2 grid gap-3 md:grid-cols-2">
                <div>
                  <p className="text-xs font-semibold uppercase tracking-wider text-ink-soft">Yours (this tab)</p>
                  <pre className="mt-1 whitespace-pre-wrap break-words rounded bg-paper-deep p-2 font-sans text-sm">
                    {shown(mine, field)}
                  </pre>
                </div>
                <div>
                  <p className="text-xs font-semibold uppercase tracking-wider text-ink-soft">Saved copy</p>
                  <pre className="mt-1 whitespace-pre-wrap break-words rounded bg-paper-deep p-2 font-sans text-sm">
                    {theirText}
                  </pre>
                </div>
              </div>
              <fieldset className="mt-2 flex flex-wrap gap-2">
                <legend className="sr-only">{label}: which to keep</legend>
                <button
                  type="button"
                  className={choiceButton}
                  aria-pressed={choice === "mine"}
                  onClick={() => setChoices({ ...choices, [id]: "mine" })}
                >
                  Keep mine
                </button>
                <button
                  type="button"
                  className={choiceButton}
                  aria-pressed={choice === "theirs"}
                  onClick={() => setChoices({ ...choices, [id]: "theirs" })}
                >
                  Take the saved one
                </button>
                <button
                  type="button"
                  className={choiceButton}
                  onClick={() =>
                    navigator.clipboard?.writeText(theirText).then(
                      () => setCopied(id),
                      () => setCopied(null),
                    )
                  }
                >
                  Copy the saved text
                </button>
                {copied === id ? (
                  <span role="status" className="self-center text-sm text-ink-soft">
                    Copied: paste it where you want it after saving.
                  </span>
                ) : null}
              </fieldset>
            </li>
          );
        })}
      </ul>
      <button
        type="button"
        className="mt-4 min-h-11 rounded-md bg-spruce-800 px-4 py-2 font-semibold text-paper hover:bg-spruce-700"
        onClick={() => onResolve(mergeDrafts(mine, theirs, choices))}
      >
        Save this combination
      </button>
    </section>
  );
}
