import type { HTMLAttributes } from "react";
import { cx } from "./cx";

export function Card({ className, ...props }: HTMLAttributes<HTMLDivElement>) {
  return <div className={cx("rounded-card border border-paper-rule bg-paper-raised shadow-card", className)} {...props} />;
}
