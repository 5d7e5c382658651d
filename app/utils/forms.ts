/** What a form's action answers when it cannot go ahead: a message, the bad fields, and what was typed. */
export type FormFailure = {
  ok: false;
  code?: string;
  message: string;
  fields?: Record<string, string>;
  values?: Record<string, string>;
};

export type FormValues = Record<string, string>;

/** A one-time message shown on the page a changed-data action redirects to. */
export type Flash = { tone: "success" | "info" | "error"; text: string };

/** Names of fields that must never be typed back into a page. */
export const isSecretField = (name: string) => /password|token|secret/i.test(name);

/** A failure from an action's answer, or null (for routes whose success answers share the type). */
export function failureOf(actionData: unknown): FormFailure | null {
  return actionData && typeof actionData === "object" && (actionData as { ok?: unknown }).ok === false
    ? (actionData as FormFailure)
    : null;
}
