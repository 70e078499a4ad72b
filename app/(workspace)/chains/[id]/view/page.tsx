import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { Workspace } from "@/components/editor/workspace";
import { chainView } from "@/lib/api/chain-view";
import type { ChainDto } from "@/lib/api/client/chains";
import { AccessError, assertChain } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Chain (read-only)" };

type Props = { params: Promise<{ id: string }> };

/**
 * /chains/:id/view: the read-only link. Anyone signed in who may see the chain opens the workspace with
 * every edit turned off, whatever their own rights (an editor sharing the link sees what the others see).
 */
export default async function ReadOnlyChainPage({ params }: Props) {
  const { id } = await params;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/chains/${id}/view`)}`);
  let chain: ChainDto;
  try {
    const rights = assertChain(user.id, "view", id);
    chain = chainView(rights.chain, rights, true) as ChainDto;
  } catch (e) {
    if (e instanceof AccessError) notFound();
    throw e;
  }
  const readOnly: ChainDto = { ...chain, role: "viewer", actions: chain.actions.filter((a) => a === "view" || a === "export") };
  return <Workspace key={`${chain.id}-view`} chain={readOnly} />;
}
