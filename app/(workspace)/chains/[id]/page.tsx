import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { Workspace } from "@/components/editor/workspace";
import { chainView } from "@/lib/api/chain-view";
import { AccessError, assertChain } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import type { ChainDto } from "@/lib/api/client/chains";

type Props = { params: Promise<{ id: string }> };

/** The chain, if the signed-in user may see it; a chain they may not see is "not found", as in the API. */
async function loadChain(id: string): Promise<ChainDto> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/chains/${id}`)}`);
  try {
    const rights = assertChain(user.id, "view", id);
    return chainView(rights.chain, rights, true) as ChainDto;
  } catch (e) {
    if (e instanceof AccessError) notFound();
    throw e;
  }
}

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { id } = await params;
  const user = await getCurrentUser();
  if (!user) return { title: "Chain" };
  try {
    return { title: assertChain(user.id, "view", id).chain.name };
  } catch {
    return { title: "Chain" };
  }
}

export default async function ChainPage({ params }: Props) {
  const { id } = await params;
  const chain = await loadChain(id);
  // key: a different chain (after "keep a copy") gets a fresh editor store
  return <Workspace key={chain.id} chain={chain} />;
}
