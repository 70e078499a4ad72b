"use client";
/**
 * One engineering-notation field of the inspector: the text as typed, the unit beside it, the value it
 * was read as, the nearest E24 and E96 values for components, and the problem in words when it does not
 * read. The input keeps whatever was typed; nothing here rewrites it.
 */
import { forwardRef, type InputHTMLAttributes } from "react";
import { cx } from "@/components/ui/cx";
import { formatCompact, formatQuantity, UNIT_SYMBOLS, type QuantityUnit } from "@/lib/units";
import { preferredHint, type FieldRead } from "./field-read";

export interface QuantityInputProps extends InputHTMLAttributes<HTMLInputElement> {
  id: string;
  label: string;
  unit: QuantityUnit;
  read: FieldRead | null;
  /** offer E24/E96 values */
  preferred?: boolean;
  /** what null means when the field is left empty (e.g. "a follower") */
  nullMeans?: string;
  /** the form's error message, when the resolver found one */
  error?: string;
  onPickPreferred?: (value: number) => void;
}

export const QuantityInput = forwardRef<HTMLInputElement, QuantityInputProps>(function QuantityInput(
  { id, label, unit, read, preferred, nullMeans, error, onPickPreferred, className, ...input },
  ref,
) {
  const symbol = UNIT_SYMBOLS[unit];
  const problem = error ?? (read?.state === "error" ? read.message : undefined);
  const value = read?.state === "ok" ? read.value : null;
  const hint = preferred ? preferredHint(value) : null;
  const noteId = `${id}-note`;
  return (
    <div className={cx("grid grid-cols-[5.5rem_1fr] items-start gap-x-2 gap-y-0.5", className)}>
      <label htmlFor={id} className="pt-1.5 text-[12.5px] text-graphite-700">
        {label}
      </label>
      <div className="min-w-0">
        <div
          className={cx(
            "flex items-center rounded-card border bg-paper-raised focus-within:border-accent-600 has-[:disabled]:border-dashed has-[:disabled]:bg-paper",
            problem ? "border-status-clip" : "border-paper-rule",
          )}
        >
          <input
            ref={ref}
            id={id}
            autoComplete="off"
            spellCheck={false}
            aria-invalid={problem ? true : undefined}
            aria-describedby={noteId}
            className="num w-full min-w-0 bg-transparent px-2 py-1 text-[13px] text-graphite-950 outline-none"
            {...input}
          />
          {symbol && <span className="num pr-2 text-[12px] text-graphite-500">{symbol}</span>}
        </div>
        <p id={noteId} className="mt-0.5 min-h-[1rem] text-[11.5px] leading-4" data-testid={`${id}-note`}>
          {problem ? (
            <span className="text-status-clip">
              <span aria-hidden>■ </span>
              {problem}
            </span>
          ) : read?.state === "empty" ? (
            <span className={read.required ? "text-status-tight" : "text-graphite-500"}>
              {read.required && <span aria-hidden>▲ </span>}
              {read.hint}
            </span>
          ) : value === null ? (
            <span className="text-graphite-500">{nullMeans ? `empty: ${nullMeans}` : ""}</span>
          ) : (
            <span className="text-graphite-500">
              <span className="num" data-testid={`${id}-parsed`}>
                = {unit === "none" && Number.isInteger(value) && Math.abs(value) < 1e6 ? String(value) : formatQuantity(value, unit, 4)}
              </span>
              {hint && (
                <>
                  {" · "}
                  <PreferredButton series="E24" value={hint.e24} current={value} unit={unit} onPick={onPickPreferred} />{" "}
                  <PreferredButton series="E96" value={hint.e96} current={value} unit={unit} onPick={onPickPreferred} />
                </>
              )}
            </span>
          )}
        </p>
      </div>
    </div>
  );
});

function PreferredButton({
  series,
  value,
  current,
  unit,
  onPick,
}: {
  series: string;
  value: number;
  current: number;
  unit: QuantityUnit;
  onPick?: (v: number) => void;
}) {
  const same = Math.abs(value / current - 1) < 1e-9;
  const text = `${series} ${formatCompact(value, unit, 3)}`;
  if (same || !onPick) return <span className="num">{same ? `${series} ✓` : text}</span>;
  return (
    <button
      type="button"
      className="num rounded px-0.5 text-accent-700 underline decoration-dotted underline-offset-2 hover:bg-accent-50"
      onClick={() => onPick(value)}
      title={`Use the nearest ${series} value`}
    >
      {text}
    </button>
  );
}
