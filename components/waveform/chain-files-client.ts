"use client";
/**
 * The browser's side of a chain's attached files (GET/POST /api/chains/:id/uploads, GET/DELETE
 * …/uploads/:fileId), shared by the Waveforms tab and the measured responses on the response plot, so
 * both read one cached list and an upload or a deletion in either refreshes both.
 */
import { useQuery, useQueryClient } from "@tanstack/react-query";

export interface StoredFile {
  id: string;
  kind: "waveform" | "response";
  name: string;
  rows: number;
  sampleRate: number | null;
}

export const chainFilesKey = (chainId: string | null) => ["chain-files", chainId] as const;

/** The chain's stored files and whether the signed-in user may add or delete them. */
export function useChainFiles(chainId: string | null, enabled: boolean) {
  const queryClient = useQueryClient();
  const query = useQuery({
    queryKey: chainFilesKey(chainId),
    enabled: enabled && chainId !== null,
    queryFn: async () => {
      const res = await fetch(`/api/chains/${chainId}/uploads`);
      if (!res.ok) throw new Error(`the list of stored files did not load (${res.status})`);
      return (await res.json()) as { files: StoredFile[]; canUpload: boolean };
    },
  });
  const refresh = () => queryClient.invalidateQueries({ queryKey: chainFilesKey(chainId) });
  return { files: query.data?.files ?? [], canUpload: query.data?.canUpload ?? false, refresh };
}

/** Stores a CSV on the chain; the server checks it again. The refusal as one line of text. */
export async function storeChainFile(chainId: string, body: { kind: StoredFile["kind"]; name: string; csv: string; sampleRate?: number | null }): Promise<{ ok: true; file: StoredFile } | { ok: false; message: string }> {
  const res = await fetch(`/api/chains/${chainId}/uploads`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const answer = (await res.json().catch(() => ({}))) as { file?: StoredFile; error?: string; errors?: { message: string }[] };
  if (res.ok && answer.file) return { ok: true, file: answer.file };
  return { ok: false, message: answer.errors?.map((e) => e.message).join("; ") ?? answer.error ?? `Refused (${res.status}).` };
}

/** A stored file's text, or null with the status when it cannot be read. */
export async function readStoredFile(chainId: string, fileId: string): Promise<{ text: string } | { status: number }> {
  const res = await fetch(`/api/chains/${chainId}/uploads/${fileId}`);
  return res.ok ? { text: await res.text() } : { status: res.status };
}

export async function deleteStoredFile(chainId: string, fileId: string): Promise<boolean> {
  return (await fetch(`/api/chains/${chainId}/uploads/${fileId}`, { method: "DELETE" })).ok;
}
