import Link from "next/link";
import { redirect } from "next/navigation";
import type { ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { Wordmark } from "@/components/ui/wordmark";
import { getCurrentUser } from "@/lib/auth/session";
import { signOutAction } from "./actions";

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  // proxy.ts turns away requests without a session cookie; this is the real check.
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-paper-rule bg-paper-raised print:hidden">
        <div className="mx-auto flex max-w-6xl items-center justify-between gap-4 px-6 py-2.5">
          <div className="flex items-center gap-6">
            <Wordmark href="/chains" />
            <nav aria-label="Workspace">
              <ul className="flex gap-1 text-sm">
                <li>
                  <Link href="/chains" className="rounded-card px-2.5 py-1.5 text-graphite-900 no-underline hover:bg-paper-sunk">
                    Chains
                  </Link>
                </li>
              </ul>
            </nav>
          </div>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-graphite-700" data-testid="signed-in-as">
              {user.name ? `${user.name} · ` : ""}
              <span className="text-graphite-500">{user.email}</span>
            </span>
            <form action={signOutAction}>
              <Button type="submit" variant="quiet">
                Sign out
              </Button>
            </form>
          </div>
        </div>
      </header>
      {/* The chain workspace (marked data-workspace) uses the full width and height under the header. */}
      <main className="mx-auto w-full max-w-6xl flex-1 px-6 py-8 print:max-w-none print:p-0 has-[>[data-workspace]]:max-w-none has-[>[data-workspace]]:p-0">{children}</main>
    </div>
  );
}
