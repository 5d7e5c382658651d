import { type ReactNode, useEffect, useRef } from "react";
import { useNavigation } from "react-router";

import type { Flash } from "~/utils/forms";

export type { FormFailure } from "~/utils/forms";

export function Field({
  label,
  name,
  type = "text",
  defaultValue,
  error,
  hint,
  autoComplete,
  required = true,
  id: givenId,
  clearOn,
}: {
  id?: string;
  /** For password fields: a new value here (the action's latest answer) empties the field, as a full page load would. */
  clearOn?: unknown;
  label: string;
  name: string;
  type?: string;
  defaultValue?: string;
  error?: string;
  hint?: string;
  autoComplete?: string;
  required?: boolean;
}) {
  const id = givenId ?? `field-${name}`;
  const input = useRef<HTMLInputElement>(null);
  useEffect(() => {
    if (type === "password" && clearOn && input.current) input.current.value = "";
  }, [clearOn, type]);
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint}>
      {(described) => (
        <input
          ref={input}
          id={id}
          name={name}
          type={type}
          defaultValue={type === "password" ? undefined : defaultValue}
          autoComplete={autoComplete}
          required={required}
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
          className={controlClass(error)}
        />
      )}
    </FieldFrame>
  );
}

/** A required choice from a list, with the same label, hint and error as `Field`. */
export function SelectField({
  label,
  name,
  options,
  defaultValue,
  error,
  hint,
}: {
  label: string;
  name: string;
  /** Pairs of value and label, in the order shown. */
  options: readonly (readonly [string, string])[];
  defaultValue?: string;
  error?: string;
  hint?: string;
}) {
  const id = `field-${name}`;
  return (
    <FieldFrame id={id} label={label} error={error} hint={hint}>
      {(described) => (
        <select
          id={id}
          name={name}
          defaultValue={defaultValue ?? ""}
          required
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
          className={controlClass(error)}
        >
          <option value="" disabled>
            Choose…
          </option>
          {options.map(([value, text]) => (
            <option key={value} value={value}>
              {text}
            </option>
          ))}
        </select>
      )}
    </FieldFrame>
  );
}

function controlClass(error: string | undefined) {
  return `mt-1.5 min-h-11 w-full rounded-md border bg-paper px-3 py-2 ${error ? "border-z-danger" : "border-rule"}`;
}

/** Label above, hint and error below, tied to the control by `aria-describedby`. */
export function FieldFrame({
  id,
  label,
  error,
  hint,
  className = "mt-4 first:mt-0",
  children,
}: {
  id: string;
  label: string;
  error?: string;
  hint?: string;
  /** The wrapper's classes (spacing in a form of fields one under another by default). */
  className?: string;
  children: (describedBy: string | undefined) => ReactNode;
}) {
  const described = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-semibold text-ink">
        {label}
      </label>
      {children(described)}
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-sm font-medium text-z-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/**
 * A message above a form. Given `focusOn` (the action's latest answer), an error summary takes the
 * focus each time that answer changes, so a keyboard or screen-reader user lands on what went wrong
 * instead of on the page body.
 */
export function Notice({
  tone,
  children,
  focusOn,
}: {
  tone: "error" | "success" | "info";
  children: ReactNode;
  focusOn?: unknown;
}) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (focusOn && box.current) box.current.focus();
  }, [focusOn]);
  const styles = {
    error: "border-z-danger bg-white text-ink",
    success: "border-spruce-500 bg-spruce-50 text-ink",
    info: "border-brass-500 bg-brass-50 text-ink",
  }[tone];
  return (
    <div
      ref={box}
      role={tone === "error" ? "alert" : "status"}
      tabIndex={focusOn ? -1 : undefined}
      className={`mb-5 rounded-md border-l-4 px-4 py-3 text-sm ${styles}`}
    >
      {children}
    </div>
  );
}

/** A refused form's message and, under it, what is wrong with each field (the fields also say so beside them). */
export function FailureNotice({
  failure,
  focusOn,
}: {
  failure: { message: string; fields?: Record<string, string> };
  focusOn?: unknown;
}) {
  return (
    <Notice tone="error" focusOn={focusOn}>
      <p className="font-semibold">{failure.message}</p>
      {failure.fields ? (
        <ul className="mt-1 list-disc pl-5">
          {Object.values(failure.fields).map((why) => (
            <li key={why}>{why}</li>
          ))}
        </ul>
      ) : null}
    </Notice>
  );
}

export function SubmitButton({
  children,
  name,
  value,
  tone = "primary",
}: {
  children: ReactNode;
  name?: string;
  value?: string;
  tone?: "primary" | "quiet" | "danger";
}) {
  const busy = useNavigation().state === "submitting";
  const styles = {
    primary: "bg-spruce-800 text-paper hover:bg-spruce-700",
    quiet: "border border-rule text-spruce-800 hover:bg-paper-deep",
    danger: "bg-z-danger text-white hover:opacity-90",
  }[tone];
  return (
    <button
      type="submit"
      name={name}
      value={value}
      disabled={busy}
      className={`min-h-11 rounded-md px-4 py-2 font-semibold disabled:opacity-60 ${styles}`}
    >
      {children}
    </button>
  );
}

/** The one-time message after a change (set by `redirectWithFlash`), above the page it led to. */
export function FlashBanner({ flash }: { flash: Flash }) {
  return (
    <div className="mx-auto mt-4 max-w-6xl px-6">
      <Notice tone={flash.tone}>{flash.text}</Notice>
    </div>
  );
}
