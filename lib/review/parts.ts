import "server-only";
import { z } from "zod";
import { partSchema } from "@/lib/chain/schema";
import { NAME_MAX, NOTES_MAX } from "@/lib/parts-csv";

/** A library model as the parts routes take it: a unique name, notes, and the part (chain-format.md). */
export const libraryPartSchema = z.object({
  name: z.string().trim().min(1, "a model needs a name").max(NAME_MAX, `at most ${NAME_MAX} characters`),
  notes: z.string().trim().max(NOTES_MAX, `at most ${NOTES_MAX} characters`).default(""),
  model: partSchema,
});

export function partJson(p: { id: string; name: string; notes: string; model: unknown; updatedAt: Date }) {
  return { id: p.id, name: p.name, notes: p.notes, model: p.model, updatedAt: p.updatedAt.toISOString() };
}
