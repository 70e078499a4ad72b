import type { ButtonHTMLAttributes } from "react";
import { cx } from "./cx";

export type ButtonVariant = "primary" | "secondary" | "quiet";

const VARIANTS: Record<ButtonVariant, string> = {
  primary: "bg-accent-700 text-white hover:bg-accent-800 disabled:bg-graphite-300",
  secondary: "border border-paper-rule bg-paper-raised text-graphite-900 hover:bg-paper-sunk disabled:text-graphite-400",
  quiet: "text-accent-700 hover:bg-accent-50 disabled:text-graphite-400",
};

/** Class list for anything that should look like a button (also used on links). */
export function buttonClass(variant: ButtonVariant = "primary", extra?: string): string {
  return cx(
    "inline-flex items-center justify-center gap-2 rounded-card px-3.5 py-2 text-sm font-medium no-underline hover:no-underline",
    "transition-colors disabled:cursor-not-allowed",
    VARIANTS[variant],
    extra,
  );
}

export function Button({
  variant = "primary",
  className,
  type = "button",
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: ButtonVariant }) {
  return <button type={type} className={buttonClass(variant, className)} {...props} />;
}
