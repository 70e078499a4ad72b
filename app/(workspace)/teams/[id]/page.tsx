import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { SectionNav } from "@/components/team/section-nav";
import { TeamSettings } from "@/components/team/team-settings";
import { listPendingInvitations } from "@/db/queries/invitations";
import { listTeamPeople } from "@/db/queries/sharing";
import { getTeam } from "@/db/queries/team-admin";
import { AccessError, assertTeam } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Team" };

type Props = { params: Promise<{ id: string }> };

export default async function TeamPage({ params }: Props) {
  const { id } = await params;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/teams/${id}`)}`);
  let actions;
  try {
    actions = assertTeam(user.id, "team:view", id);
  } catch (e) {
    if (e instanceof AccessError) notFound();
    throw e;
  }
  const team = getTeam(id)!;
  const manage = actions.has("team:manage");
  const invitations = manage ? listPendingInvitations({ teamId: id }).map((i) => ({ ...i, createdAt: i.createdAt.toISOString(), expiresAt: i.expiresAt.toISOString() })) : [];
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">{team.name}</h1>
        <p className="mt-1 text-sm text-graphite-500">
          Admins hold owner rights on every chain of the team; engineers read every team chain, create chains and edit the op-amp library;
          reviewers read and comment on every team chain and review those they are asked to.
        </p>
      </div>
      <SectionNav current="/teams" />
      <TeamSettings teamId={id} teamName={team.name} meId={user.id} manage={manage} members={listTeamPeople(id)} invitations={invitations} />
    </div>
  );
}
