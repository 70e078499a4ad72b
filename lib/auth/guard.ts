import "server-only";
import { notFound, redirect } from "next/navigation";
import type { User } from "@/db/schema";
import {
  AccessError,
  assertChain,
  assertTeam,
  type ChainAction,
  type ChainRights,
  type TeamAction,
} from "./permissions";
import { getCurrentUser } from "./session";

/** The signed-in user or AccessError(401). */
export async function requireUser(): Promise<User> {
  const user = await getCurrentUser();
  if (!user) throw new AccessError(401, "Sign in first.");
  return user;
}

/** The signed-in user and their rights on a chain, if they may do `action` to it; else AccessError. */
export async function requireChain(action: ChainAction, chainId: string): Promise<ChainRights & { user: User }> {
  const user = await requireUser();
  return { user, ...assertChain(user.id, action, chainId) };
}

export async function requireTeam(action: TeamAction, teamId: string): Promise<{ user: User; actions: Set<TeamAction> }> {
  const user = await requireUser();
  return { user, actions: assertTeam(user.id, action, teamId) };
}

/**
 * For pages: the signed-in user and their rights on a chain. A signed-out visitor goes to sign-in and
 * comes back to `path`; a chain they may not see, or may not do `action` to, is "not found", as in the API.
 */
export async function pageChain(action: ChainAction, chainId: string, path: string): Promise<ChainRights & { user: User }> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  try {
    return { user, ...assertChain(user.id, action, chainId) };
  } catch (e) {
    if (e instanceof AccessError) notFound();
    throw e;
  }
}
