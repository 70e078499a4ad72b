import Link from "next/link";
import { cx } from "@/components/ui/cx";

const LINKS = [
  { href: "/chains", label: "Chains" },
  { href: "/parts", label: "Op-amp library" },
  { href: "/teams", label: "Teams" },
  { href: "/settings", label: "Settings" },
] as const;

/** The workspace's own pages, as tabs under the page title (keyboard reachable links). */
export function SectionNav({ current }: { current: (typeof LINKS)[number]["href"] }) {
  return (
    <nav aria-label="Workspace sections" className="flex gap-1 border-b border-paper-rule text-sm">
      {LINKS.map((l) => (
        <Link
          key={l.href}
          href={l.href}
          aria-current={l.href === current ? "page" : undefined}
          className={cx("-mb-px border-b-2 px-3 py-1.5 no-underline", l.href === current ? "border-accent-600 font-medium text-graphite-950" : "border-transparent text-graphite-500 hover:text-graphite-900")}
        >
          {l.label}
        </Link>
      ))}
    </nav>
  );
}
