import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "../connection";
import { chainFiles, type ChainFile } from "../schema";

export type NewChainFile = Omit<typeof chainFiles.$inferInsert, "id" | "createdAt"> & { id: string };

export function insertChainFile(row: NewChainFile): ChainFile {
  return getDb().insert(chainFiles).values(row).returning().get();
}

/** A chain's files, oldest first. */
export function listChainFiles(chainId: string): ChainFile[] {
  return getDb().select().from(chainFiles).where(eq(chainFiles.chainId, chainId)).orderBy(asc(chainFiles.createdAt), asc(chainFiles.id)).all();
}

/** One file of a chain (null when it is not this chain's). */
export function getChainFile(chainId: string, id: string): ChainFile | null {
  return getDb().select().from(chainFiles).where(and(eq(chainFiles.chainId, chainId), eq(chainFiles.id, id))).get() ?? null;
}

/** Deletes the row; returns it, or null when there was none. */
export function deleteChainFile(chainId: string, id: string): ChainFile | null {
  return getDb().delete(chainFiles).where(and(eq(chainFiles.chainId, chainId), eq(chainFiles.id, id))).returning().get() ?? null;
}
