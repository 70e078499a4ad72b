import type { InputHTMLAttributes } from "react";
import { cx } from "./cx";

/**
 * A labelled input with an optional hint and error. The error is tied to the input with
 * aria-describedby so screen readers announce it with the field.
 */
export function Field({
  label,
  name,
  hint,
  error,
  className,
  id: givenId,
  ...input
}: InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; hint?: string; error?: string }) {
  const id = givenId ?? `field-${name}`;
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-sm font-medium text-graphite-700">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cx(
          "rounded-card border bg-paper-raised px-3 py-2 text-sm text-graphite-900 placeholder:text-graphite-300",
          error ? "border-status-clip" : "border-paper-rule focus:border-accent-600",
        )}
        {...input}
      />
      {hint ? (
        <p id={`${id}-hint`} className="text-xs text-graphite-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="text-xs text-status-clip">
          {error}
        </p>
      ) : null}
    </div>
  );
}
