"use client";
/** TanStack Query keys and fetchers for the team panels of one chain. */
import { useQuery } from "@tanstack/react-query";
import { fetchJson } from "@/lib/api/client/fetch-json";

export interface RoundView {
  round: string;
  open: boolean;
  requestedBy: { id: string; name: string | null } | null;
  requestedAt: string;
  requestedRevision: { id: string; number: number };
  note: string;
  closedAt: string | null;
  closedReason: string | null;
  reviewers: Array<{ id: string; reviewer: { id: string; name: string | null }; decision: string; note: string; decidedAt: string | null; decidedRevision: { id: string; number: number } | null }>;
}

export interface ReviewsData {
  reviewState: string;
  version: number;
  rounds: RoundView[];
  me: { id: string; actions: string[] };
}

export interface ThreadData {
  id: string;
  nodeId: string | null;
  resolvedAt: string | null;
  resolvedBy: { id: string; name: string | null } | null;
  comments: Array<{ id: string; body: string; author: { id: string; name: string | null } | null; createdAt: string }>;
}

export interface ThreadsData {
  threads: ThreadData[];
  me: { id: string; canComment: boolean; canModerate: boolean };
}

export interface MembersData {
  members: Array<{ userId: string; name: string | null; email: string | null; role: string }>;
  candidates?: Array<{ userId: string; name: string | null; email: string | null; teamRole: string }>;
  reviewers?: Array<{ userId: string; name: string | null }>;
}

export const teamKeys = {
  reviews: (id: string) => ["chain-reviews", id] as const,
  threads: (id: string) => ["chain-threads", id] as const,
  members: (id: string) => ["chain-members", id] as const,
  invitations: (id: string) => ["chain-invitations", id] as const,
};

const base = (id: string) => `/api/chains/${encodeURIComponent(id)}`;

export function useReviews(chainId: string) {
  return useQuery({ queryKey: teamKeys.reviews(chainId), queryFn: () => fetchJson<ReviewsData>(`${base(chainId)}/reviews`) });
}

export function useThreads(chainId: string) {
  return useQuery({ queryKey: teamKeys.threads(chainId), queryFn: () => fetchJson<ThreadsData>(`${base(chainId)}/comments`) });
}

export function useMembers(chainId: string) {
  return useQuery({ queryKey: teamKeys.members(chainId), queryFn: () => fetchJson<MembersData>(`${base(chainId)}/members`) });
}

export { base as chainApiBase };
