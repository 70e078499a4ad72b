import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Part } from "@/lib/chain/types";
import { getDb } from "../connection";
import { parts, type PartRow } from "../schema";

export interface LibraryPart {
  id: string;
  name: string;
  notes: string;
  model: Part;
  updatedAt: Date;
}

function view(row: PartRow): LibraryPart {
  return { id: row.id, name: row.name, notes: row.notes, model: JSON.parse(row.model) as Part, updatedAt: row.updatedAt };
}

export function listParts(teamId: string): LibraryPart[] {
  return getDb().select().from(parts).where(eq(parts.teamId, teamId)).orderBy(asc(parts.name)).all().map(view);
}

export function getPart(teamId: string, id: string): LibraryPart | undefined {
  const row = getDb()
    .select()
    .from(parts)
    .where(and(eq(parts.teamId, teamId), eq(parts.id, id)))
    .get();
  return row ? view(row) : undefined;
}

/** A part by id, with its team (for routes addressed by part id alone). */
export function findPart(id: string): (LibraryPart & { teamId: string }) | undefined {
  const row = getDb().select().from(parts).where(eq(parts.id, id)).get();
  return row ? { ...view(row), teamId: row.teamId } : undefined;
}

export function partNamesTaken(teamId: string, names: string[]): Set<string> {
  if (!names.length) return new Set();
  const rows = getDb()
    .select({ name: parts.name })
    .from(parts)
    .where(and(eq(parts.teamId, teamId), inArray(parts.name, names)))
    .all();
  return new Set(rows.map((r) => r.name));
}

export interface PartInput {
  name: string;
  notes: string;
  model: Part;
}

/** SQLite's unique (team, name) index refused the row. */
export function isNameTaken(err: unknown): boolean {
  return err instanceof Error && /UNIQUE constraint failed: parts\.team_id, parts\.name/.test(err.message);
}

export function insertPart(teamId: string, input: PartInput, userId: string): LibraryPart {
  const row = getDb()
    .insert(parts)
    .values({ teamId, name: input.name, notes: input.notes, model: JSON.stringify(input.model), createdBy: userId })
    .returning()
    .get();
  return view(row);
}

/** Store many models at once: all or none (one bad row leaves the library as it was). */
export function insertParts(teamId: string, inputs: PartInput[], userId: string): number {
  const db = getDb();
  return db.transaction((tx) => {
    for (const p of inputs) {
      tx.insert(parts).values({ teamId, name: p.name, notes: p.notes, model: JSON.stringify(p.model), createdBy: userId }).run();
    }
    return inputs.length;
  });
}

export function updatePart(teamId: string, id: string, input: PartInput): LibraryPart | undefined {
  const row = getDb()
    .update(parts)
    .set({ name: input.name, notes: input.notes, model: JSON.stringify(input.model), updatedAt: new Date() })
    .where(and(eq(parts.teamId, teamId), eq(parts.id, id)))
    .returning()
    .get();
  return row ? view(row) : undefined;
}

export function deletePart(teamId: string, id: string): boolean {
  return getDb().delete(parts).where(and(eq(parts.teamId, teamId), eq(parts.id, id))).run().changes > 0;
}
