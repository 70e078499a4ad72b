/**
 * Browser-side access to the chain routes (/api/chains, /api/chains/:id) for the workspace, as plain
 * fetchers and TanStack Query hooks. Refusals come back as ApiFailure with the route's JSON body, so the
 * workspace can tell a stale save (409, with the current version) from a lost session or a bad field.
 */
"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { ApiFailure, fetchJson } from "./fetch-json";

export { ApiFailure };

export interface ChainDto {
  id: string;
  teamId: string;
  name: string;
  version: number;
  reviewState: string;
  worstStatus: string | null;
  createdAt: string;
  updatedAt: string;
  role: "owner" | "editor" | "reviewer" | "viewer" | null;
  actions: string[];
  document?: unknown;
}

export const chainKey = (id: string) => ["chain", id] as const;

export async function fetchChain(id: string): Promise<ChainDto> {
  return (await fetchJson<{ chain: ChainDto }>(`/api/chains/${encodeURIComponent(id)}`)).chain;
}

export interface SaveInput {
  id: string;
  baseVersion: number;
  document: unknown;
  summary?: string;
}

/** Save a new version; a stale baseVersion throws ApiFailure 409 with `currentVersion`. */
export async function saveChain(input: SaveInput): Promise<ChainDto> {
  const { id, ...body } = input;
  return (await fetchJson<{ chain: ChainDto }>(`/api/chains/${encodeURIComponent(id)}`, { method: "PUT", body })).chain;
}

export async function createChain(input: { name?: string; document?: unknown; teamId?: string }): Promise<ChainDto> {
  return (await fetchJson<{ chain: ChainDto }>(`/api/chains`, { method: "POST", body: input })).chain;
}

export function useChainQuery(id: string, initial?: ChainDto) {
  return useQuery({ queryKey: chainKey(id), queryFn: () => fetchChain(id), initialData: initial, staleTime: Infinity });
}

export function useSaveChain() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: saveChain,
    onSuccess: (chain) => qc.setQueryData(chainKey(chain.id), (old: ChainDto | undefined) => ({ ...old, ...chain })),
  });
}

export function useCreateChain() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createChain,
    onSuccess: (chain) => qc.setQueryData(chainKey(chain.id), chain),
  });
}
