"use client";
/**
 * Who has this chain and in what role: change or remove a share, add a team member directly, or
 * invite anyone by e-mail (a single-use link bound to that address, valid for 7 days).
 */
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { chainApiBase, teamKeys, useMembers } from "@/components/review/queries";
import { ROLE_WORDS, shortTime } from "@/components/review/review-words";

const CHAIN_ROLES = ["owner", "editor", "reviewer", "viewer"] as const;

interface PendingInvite {
  id: string;
  email: string;
  role: string;
  expiresAt: string;
}

export function SharePanel({ chainId, canShare }: { chainId: string; canShare: boolean }) {
  const members = useMembers(chainId);
  const qc = useQueryClient();
  const base = chainApiBase(chainId);
  const invites = useQuery({
    queryKey: teamKeys.invitations(chainId),
    queryFn: () => fetchJson<{ invitations: PendingInvite[] }>(`${base}/invitations`),
    enabled: canShare,
  });
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const after = (message?: string) => {
    setProblem(null);
    setDone(message ?? null);
    void qc.invalidateQueries({ queryKey: teamKeys.members(chainId) });
    void qc.invalidateQueries({ queryKey: teamKeys.invitations(chainId) });
    void qc.invalidateQueries({ queryKey: teamKeys.reviews(chainId) });
  };
  const onError = (e: unknown) => {
    setDone(null);
    setProblem(problemText(e));
  };
  const change = useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: string | null }) =>
      fetchJson(`${base}/members/${userId}`, role ? { method: "PATCH", body: { role } } : { method: "DELETE" }),
    onSuccess: () => after(),
    onError,
  });
  const add = useMutation({ mutationFn: (v: { userId: string; role: string }) => fetchJson(`${base}/members`, { method: "POST", body: v }), onSuccess: () => after(), onError });
  const invite = useMutation({
    mutationFn: (v: { email: string; role: string }) => fetchJson(`${base}/invitations`, { method: "POST", body: v }),
    onSuccess: (_r, v) => after(`Invitation sent to ${v.email}.`),
    onError,
  });
  const revoke = useMutation({ mutationFn: (id: string) => fetchJson(`${base}/invitations/${id}`, { method: "DELETE" }), onSuccess: () => after("Invitation withdrawn."), onError });
  const [email, setEmail] = useState("");
  const [inviteRole, setInviteRole] = useState("reviewer");
  const [addUser, setAddUser] = useState("");
  const [addRole, setAddRole] = useState("viewer");

  if (members.isPending) return <p className="p-3 text-sm text-graphite-500">Loading…</p>;
  if (members.isError) return <p className="p-3 text-sm text-status-clip">■ {problemText(members.error)}</p>;
  const candidates = members.data.candidates ?? [];
  return (
    <div className="flex flex-col gap-4 p-3 text-sm" data-testid="share-panel">
      <section>
        <h3 className="mb-1.5 text-[12px] font-semibold uppercase tracking-wide text-graphite-500">People with a share</h3>
        <ul className="flex flex-col gap-1.5" data-testid="members">
          {members.data.members.map((m) => (
            <li key={m.userId} className="flex items-center justify-between gap-2">
              <span className="min-w-0">
                <span className="block truncate font-medium text-graphite-950">{m.name ?? "Unnamed"}</span>
                <span className="block truncate text-[12px] text-graphite-500">{m.email}</span>
              </span>
              {canShare ? (
                <span className="flex items-center gap-1">
                  <select
                    aria-label={`Role of ${m.name ?? m.email}`}
                    value={m.role}
                    onChange={(e) => change.mutate({ userId: m.userId, role: e.target.value })}
                    className="rounded-card border border-paper-rule bg-paper-raised px-1 py-0.5 text-[12.5px]"
                  >
                    {CHAIN_ROLES.map((r) => (
                      <option key={r} value={r}>
                        {ROLE_WORDS[r]}
                      </option>
                    ))}
                  </select>
                  <button type="button" className="rounded px-1 text-[12px] text-graphite-500 hover:text-status-clip" onClick={() => change.mutate({ userId: m.userId, role: null })} aria-label={`Remove ${m.name ?? m.email}`}>
                    remove
                  </button>
                </span>
              ) : (
                <span className="text-[12.5px] text-graphite-700">{ROLE_WORDS[m.role]}</span>
              )}
            </li>
          ))}
        </ul>
      </section>
      {canShare && candidates.length > 0 && (
        <form
          className="flex flex-col gap-1.5 border-t border-paper-rule pt-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (addUser) add.mutate({ userId: addUser, role: addRole });
          }}
        >
          <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Add someone from the team</h3>
          <div className="flex gap-1.5">
            <select aria-label="Team member" value={addUser} onChange={(e) => setAddUser(e.target.value)} className="min-w-0 flex-1 rounded-card border border-paper-rule bg-paper-raised px-1 py-1 text-[12.5px]">
              <option value="">Choose…</option>
              {candidates.map((c) => (
                <option key={c.userId} value={c.userId}>
                  {c.name ?? c.email}
                </option>
              ))}
            </select>
            <select aria-label="Role for the team member" value={addRole} onChange={(e) => setAddRole(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-1 py-1 text-[12.5px]">
              {CHAIN_ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_WORDS[r]}
                </option>
              ))}
            </select>
            <Button type="submit" variant="secondary" disabled={!addUser}>
              Add
            </Button>
          </div>
        </form>
      )}
      {canShare && (
        <form
          className="flex flex-col gap-1.5 border-t border-paper-rule pt-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (email.trim()) invite.mutate({ email: email.trim(), role: inviteRole });
          }}
        >
          <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Invite by e-mail</h3>
          <label htmlFor="invite-email" className="text-[12.5px] text-graphite-700">
            E-mail address
          </label>
          <input id="invite-email" type="email" value={email} onChange={(e) => setEmail(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1.5 text-sm" />
          <div className="flex items-center gap-1.5">
            <label htmlFor="invite-role" className="text-[12.5px] text-graphite-700">
              as
            </label>
            <select id="invite-role" value={inviteRole} onChange={(e) => setInviteRole(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-1 py-1 text-[12.5px]">
              {CHAIN_ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_WORDS[r]}
                </option>
              ))}
            </select>
            <Button type="submit" disabled={invite.isPending || !email.trim()}>
              Send invitation
            </Button>
          </div>
          <p className="text-[12px] text-graphite-500">The link works once, only for that address, for 7 days. Someone without an account signs up through it.</p>
        </form>
      )}
      {canShare && (invites.data?.invitations.length ?? 0) > 0 && (
        <section className="border-t border-paper-rule pt-3">
          <h3 className="mb-1 text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Waiting invitations</h3>
          <ul className="flex flex-col gap-1" data-testid="pending-invitations">
            {invites.data!.invitations.map((i) => (
              <li key={i.id} className="flex items-center justify-between gap-2 text-[12.5px]">
                <span className="truncate">
                  {i.email} · {ROLE_WORDS[i.role] ?? i.role} · until <span className="num">{shortTime(i.expiresAt)}</span>
                </span>
                <button type="button" className="text-graphite-500 hover:text-status-clip" onClick={() => revoke.mutate(i.id)}>
                  withdraw
                </button>
              </li>
            ))}
          </ul>
        </section>
      )}
      {done && (
        <p role="status" className="text-[12.5px] text-graphite-700" data-testid="share-done">
          ○ {done}
        </p>
      )}
      {problem && <Notice tone="problem">{problem}</Notice>}
    </div>
  );
}
