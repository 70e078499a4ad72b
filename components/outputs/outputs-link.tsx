"use client";
/** The workspace bar's way to the chain's hand-offs: the outputs page and the design report. */
import Link from "next/link";
import { useEditor } from "@/lib/store/editor-context";

export function OutputsLinks() {
  const chainId = useEditor((s) => s.chainId);
  if (!chainId) return null;
  const cls = "rounded-card px-2 py-1 text-[12.5px] text-graphite-900 no-underline hover:bg-paper-sunk";
  return (
    <nav aria-label="Hand-offs" className="flex items-center">
      <Link href={`/chains/${chainId}/outputs`} className={cls} data-testid="outputs-link">
        Outputs
      </Link>
      <Link href={`/chains/${chainId}/report`} className={cls}>
        Report
      </Link>
    </nav>
  );
}
