import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { NewChainChooser } from "@/components/editor/new-chain-chooser";
import { getCurrentUser } from "@/lib/auth/session";
import { TEMPLATES } from "@/lib/templates";

export const metadata: Metadata = { title: "New chain" };

export default async function NewChainPage() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/chains/new");
  const templates = TEMPLATES.map((t) => ({ key: t.key, title: t.title, summary: t.summary, kinds: t.make().nodes.map((n) => n.kind) }));
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">New chain</h1>
        <p className="mt-1 text-sm text-graphite-500">Start from a blank sheet or from one of these example chains, then change anything.</p>
      </div>
      <NewChainChooser templates={templates} />
    </div>
  );
}
