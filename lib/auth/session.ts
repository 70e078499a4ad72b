import "server-only";
import { getUserById } from "@/db/queries/users";
import type { User } from "@/db/schema";
import { auth } from "./index";

/**
 * The signed-in user, loaded from the database (a session for a deleted user counts as none).
 * Route handlers and pages get the user only through here, which also gives tests one seam to
 * stand in for a session.
 */
export async function getCurrentUser(): Promise<User | null> {
  const session = await auth();
  const id = session?.user?.id;
  if (!id) return null;
  return getUserById(id) ?? null;
}
