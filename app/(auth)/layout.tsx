import type { ReactNode } from "react";
import { Wordmark } from "@/components/ui/wordmark";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-paper px-6 py-12">
      <div className="w-full max-w-[440px]">
        <div className="mb-8">
          <Wordmark />
        </div>
        <main>{children}</main>
      </div>
    </div>
  );
}
