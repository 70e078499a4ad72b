import { apiRoute } from "@/lib/api/handler";
import { requireChain } from "@/lib/auth/guard";
import { readChainFile, removeChainFile } from "@/lib/storage/chain-files";

type Context = { params: Promise<{ id: string; fileId: string }> };

/** GET /api/chains/:id/uploads/:fileId: the stored CSV as text/csv. */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id, fileId } = await params;
  await requireChain("view", id);
  const { file, text } = await readChainFile(id, fileId);
  return new Response(text, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${file.name.replace(/[^A-Za-z0-9._ -]/g, "_")}"`,
      "x-chain-file-kind": file.kind,
      ...(file.sampleRate !== null ? { "x-sample-rate": String(file.sampleRate) } : {}),
    },
  });
});

/** DELETE /api/chains/:id/uploads/:fileId: removes the file (editors and owners). */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, fileId } = await params;
  await requireChain("edit", id);
  await removeChainFile(id, fileId);
  return Response.json({ deleted: fileId });
});
