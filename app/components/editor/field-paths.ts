/**
 * How the editor names its fields. A message from the API or the engine is keyed by a dotted path
 * ("steps.2.callouts.1.value"); the input for it has the id `field-steps-2-callouts-1-value`, so a
 * list of problems can jump straight to the place to fix.
 */
export type FieldErrors = Record<string, string>;

export function fieldId(path: string): string {
  return `field-${path.replace(/\./g, "-")}`;
}

export function joinPath(...parts: (string | number)[]): string {
  return parts.filter((p) => p !== "").join(".");
}

/**
 * The ids to try for a path, best first: the field itself, the field a message may name in its
 * stead (a load is one input, keyed by whichever of watts or amps is shown), then each enclosing
 * path up to the list, so a problem always lands near its place even when the exact input is not
 * on screen (a fitment row of a generation not open, a wire size inside a switch feed not chosen).
 */
export function candidateIds(path: string): string[] {
  const parts = path.split(".").filter(Boolean);
  const ids: string[] = [];
  for (let end = parts.length; end > 0; end--) {
    const head = parts.slice(0, end);
    ids.push(fieldId(head.join(".")));
    const last = head[head.length - 1];
    const twin = LOAD_TWIN[last];
    if (twin) ids.push(fieldId([...head.slice(0, -1), twin].join(".")));
  }
  return ids;
}

const LOAD_TWIN: Record<string, string> = { loadWatts: "loadAmps", loadAmps: "loadWatts" };

const FOCUSABLE = "input:not([type=hidden]), select, textarea, button";

/**
 * Scrolls to the field for `path` and gives it the focus: an input itself, a row or callout (which
 * carries tabindex="-1" and a name) as a whole, a group of choices through its chosen or first input.
 * Returns the element reached, or null when nothing of the path is on the page.
 */
export function focusField(path: string, root: Pick<Document, "getElementById"> = document): HTMLElement | null {
  for (const id of candidateIds(path)) {
    const element = root.getElementById(id);
    if (!element) continue;
    const target =
      element.matches("input, select, textarea, button") || element.hasAttribute("tabindex")
        ? element
        : (element.querySelector<HTMLElement>("input[type=radio]:checked") ??
          element.querySelector<HTMLElement>(FOCUSABLE) ??
          element);
    target.scrollIntoView({ block: "center" });
    target.focus({ preventScroll: true });
    return target;
  }
  return null;
}
