"use client";
/** A team's members and their roles; admins change roles, remove members, invite by e-mail and rename. */
import { useState } from "react";
import { useRouter } from "next/navigation";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { ROLE_WORDS, shortTime } from "@/components/review/review-words";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";

const TEAM_ROLES = ["admin", "engineer", "reviewer"] as const;

export function TeamSettings(props: {
  teamId: string;
  teamName: string;
  meId: string;
  manage: boolean;
  members: Array<{ userId: string; name: string | null; email: string | null; teamRole: string }>;
  invitations: Array<{ id: string; email: string; role: string; expiresAt: string }>;
}) {
  const router = useRouter();
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [email, setEmail] = useState("");
  const [role, setRole] = useState("engineer");
  const [name, setName] = useState(props.teamName);
  const base = `/api/teams/${props.teamId}`;
  const act = async (fn: () => Promise<unknown>, message?: string) => {
    setProblem(null);
    setDone(null);
    try {
      await fn();
      if (message) setDone(message);
      router.refresh();
    } catch (e) {
      setProblem(problemText(e));
    }
  };
  const select = "rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-sm";
  return (
    <div className="grid grid-cols-[minmax(0,3fr)_minmax(0,2fr)] gap-6">
      <section aria-label="Members">
        <table className="w-full text-left text-sm" data-testid="team-members">
          <thead className="border-b border-paper-rule text-xs uppercase tracking-wide text-graphite-500">
            <tr>
              <th className="py-2 pr-2 font-medium">Name</th>
              <th className="py-2 pr-2 font-medium">E-mail</th>
              <th className="py-2 pr-2 font-medium">Team role</th>
              {props.manage && <th className="py-2 font-medium"><span className="sr-only">Remove</span></th>}
            </tr>
          </thead>
          <tbody>
            {props.members.map((m) => (
              <tr key={m.userId} className="border-b border-paper-rule">
                <td className="py-2 pr-2 font-medium text-graphite-950">{m.name ?? "Unnamed"}</td>
                <td className="py-2 pr-2 text-graphite-700">{m.email}</td>
                <td className="py-2 pr-2">
                  {props.manage ? (
                    <select aria-label={`Team role of ${m.name ?? m.email}`} value={m.teamRole} className={select} onChange={(e) => act(() => fetchJson(`${base}/members/${m.userId}`, { method: "PATCH", body: { role: e.target.value } }))}>
                      {TEAM_ROLES.map((r) => (
                        <option key={r} value={r}>
                          {ROLE_WORDS[r]}
                        </option>
                      ))}
                    </select>
                  ) : (
                    ROLE_WORDS[m.teamRole]
                  )}
                </td>
                {props.manage && (
                  <td className="py-2 text-right">
                    <button
                      type="button"
                      className="text-[12.5px] text-graphite-500 hover:text-status-clip"
                      onClick={() => {
                        if (window.confirm(`Remove ${m.name ?? m.email} from the team? Shares they hold on single chains stay.`)) void act(() => fetchJson(`${base}/members/${m.userId}`, { method: "DELETE" }));
                      }}
                    >
                      {m.userId === props.meId ? "leave" : "remove"}
                    </button>
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {props.manage && (
        <section className="flex flex-col gap-5" aria-label="Manage the team">
          <form
            className="flex flex-col gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              void act(() => fetchJson(`${base}/invitations`, { method: "POST", body: { email: email.trim(), role } }), `Invitation sent to ${email.trim()}.`).then(() => setEmail(""));
            }}
          >
            <h2 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Invite to the team</h2>
            <label htmlFor="team-invite-email" className="text-sm text-graphite-700">
              E-mail address
            </label>
            <input id="team-invite-email" type="email" value={email} onChange={(e) => setEmail(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1.5 text-sm" />
            <div className="flex items-center gap-2">
              <label htmlFor="team-invite-role" className="text-sm text-graphite-700">
                as
              </label>
              <select id="team-invite-role" value={role} onChange={(e) => setRole(e.target.value)} className={select}>
                {TEAM_ROLES.map((r) => (
                  <option key={r} value={r}>
                    {ROLE_WORDS[r]}
                  </option>
                ))}
              </select>
              <Button type="submit" disabled={!email.trim()}>
                Send invitation
              </Button>
            </div>
          </form>
          {props.invitations.length > 0 && (
            <div>
              <h2 className="mb-1 text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Waiting invitations</h2>
              <ul className="flex flex-col gap-1 text-sm">
                {props.invitations.map((i) => (
                  <li key={i.id} className="flex justify-between gap-2">
                    <span>
                      {i.email} · {ROLE_WORDS[i.role] ?? i.role} · until <span className="num">{shortTime(i.expiresAt)}</span>
                    </span>
                    <button type="button" className="text-graphite-500 hover:text-status-clip" onClick={() => act(() => fetchJson(`${base}/invitations/${i.id}`, { method: "DELETE" }), "Invitation withdrawn.")}>
                      withdraw
                    </button>
                  </li>
                ))}
              </ul>
            </div>
          )}
          <form
            className="flex flex-col gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              void act(() => fetchJson(base, { method: "PATCH", body: { name } }), "Team renamed.");
            }}
          >
            <label htmlFor="team-name" className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">
              Team name
            </label>
            <div className="flex gap-2">
              <input id="team-name" value={name} onChange={(e) => setName(e.target.value)} maxLength={100} className="min-w-0 flex-1 rounded-card border border-paper-rule bg-paper-raised px-2 py-1.5 text-sm" />
              <Button type="submit" variant="secondary" disabled={!name.trim() || name === props.teamName}>
                Rename
              </Button>
            </div>
          </form>
          {done && <p role="status" className="text-sm text-graphite-700">○ {done}</p>}
          {problem && <Notice tone="problem">{problem}</Notice>}
        </section>
      )}
    </div>
  );
}
