import { SafetyNotice } from "~/components/chrome";

/**
 * The standing caution of the editor: the reader pages' own notice (the same words readers see
 * on every guide and in the planner), and what the checks here do and do not do.
 */
export function EditorSafetyNotice() {
  return (
    <div className="space-y-2" data-testid="editor-safety-notice">
      <SafetyNotice compact />
      <p className="px-1 text-xs text-ink-soft">
        Readers see this notice with your guide. The engine's findings and an editor's review check the electrical, lifting and
        high-voltage content you write; they do not replace the vehicle maker's instructions, local codes or a qualified
        technician's check of high-voltage and airbag-area work.
      </p>
    </div>
  );
}
