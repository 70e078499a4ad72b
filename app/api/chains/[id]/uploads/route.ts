import { z } from "zod";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { CHAIN_FILE_KINDS } from "@/lib/domain";
import { addChainFile, chainFilesOf, FILE_LIMITS } from "@/lib/storage/chain-files";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id/uploads: the chain's recorded waveforms and measured responses (metadata). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { actions } = await requireChain("view", id);
  return Response.json({ files: chainFilesOf(id), canUpload: actions.has("edit") });
});

const uploadSchema = z.object({
  kind: z.enum(CHAIN_FILE_KINDS, "a waveform or a response"),
  name: z
    .string()
    .trim()
    .min(1, "give the file a name")
    .max(120, "at most 120 characters")
    .regex(/^[^/\\\u0000-\u001f]+$/, "no slashes or control characters"),
  csv: z.string().min(1, "the file is empty"),
  sampleRate: z.number().positive("a positive number of hertz").finite().nullable().optional(),
  tolerance: z.number().gt(0, "a fraction above 0").lt(1, "a fraction below 1").optional(),
});

/** Largest JSON body: the largest CSV plus room for escaping its line ends and quotes. */
const BODY_LIMIT = Math.ceil(Math.max(...Object.values(FILE_LIMITS)) * 1.25) + 4096;

/**
 * POST /api/chains/:id/uploads `{ kind, name, csv, sampleRate?, tolerance? }`: checks the CSV as the
 * preview did (every problem with its line and column; 400), the size (413), then stores it.
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user } = await requireChain("edit", id);
  const body = await parseBody(request, uploadSchema, BODY_LIMIT);
  const file = await addChainFile({ chainId: id, userId: user.id, ...body });
  return Response.json({ file }, { status: 201 });
});
