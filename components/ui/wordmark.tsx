import Link from "next/link";

/** The product's name with its small mark: three linked stages drawn as a stepped line. */
export function Wordmark({ href = "/" }: { href?: string }) {
  return (
    <Link href={href} className="inline-flex items-center gap-2 text-graphite-950 no-underline hover:no-underline">
      <svg width="22" height="22" viewBox="0 0 22 22" aria-hidden="true">
        <rect x="1" y="1" width="20" height="20" rx="4" fill="none" stroke="currentColor" strokeWidth="1.5" />
        <path d="M5 15 H8 V11 H12 V7 H17" fill="none" stroke="#1e6d6a" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      <span className="text-[15px] font-semibold tracking-tight">Chainwright</span>
    </Link>
  );
}
