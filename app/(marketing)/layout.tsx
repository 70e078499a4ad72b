import Link from "next/link";
import type { ReactNode } from "react";
import { buttonClass } from "@/components/ui/button";
import { Wordmark } from "@/components/ui/wordmark";
import { SafetyCaution } from "@/components/safety-caution";

export default function MarketingLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-paper-rule bg-paper-raised">
        <nav aria-label="Main" className="mx-auto flex max-w-5xl items-center justify-between px-6 py-3">
          <Wordmark />
          <div className="flex items-center gap-2">
            <Link href="/sign-in" className={buttonClass("quiet")}>
              Sign in
            </Link>
            <Link href="/sign-up" className={buttonClass("primary")}>
              Create an account
            </Link>
          </div>
        </nav>
      </header>
      <main className="flex-1">{children}</main>
      <footer className="border-t border-paper-rule bg-paper-raised">
        <div className="mx-auto max-w-5xl px-6 py-5 text-xs text-graphite-500">
          <SafetyCaution />
        </div>
      </footer>
    </div>
  );
}
