import type { Metadata } from "next";
import { Workspace } from "@/components/editor/workspace";
import { chainView } from "@/lib/api/chain-view";
import type { ChainDto } from "@/lib/api/client/chains";
import { pageChain } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Chain (read-only)" };

type Props = { params: Promise<{ id: string }> };

/**
 * /chains/:id/view: the read-only link. Anyone signed in who may see the chain opens the workspace with
 * every edit turned off, whatever their own rights (an editor sharing the link sees what the others see).
 */
export default async function ReadOnlyChainPage({ params }: Props) {
  const { id } = await params;
  const rights = await pageChain("view", id, `/chains/${id}/view`);
  const chain = chainView(rights.chain, rights, true) as ChainDto;
  const readOnly: ChainDto = { ...chain, role: "viewer", actions: chain.actions.filter((a) => a === "view" || a === "export") };
  return <Workspace key={`${chain.id}-view`} chain={readOnly} />;
}
