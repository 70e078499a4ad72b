import { getDb } from "@/db/connection";
import { createInvitation } from "@/db/queries/invitations";
import { insertPart } from "@/db/queries/parts";
import { requestReview } from "@/db/queries/reviews";
import { addComment } from "@/db/queries/comments";
import { saveChainWithHistory, listRevisions } from "@/db/queries/history";
import { users, type User } from "@/db/schema";
import { draftDocument, makeChain, makeTeam, makeUser, share } from "./fixtures";

/**
 * One chain in one team with a person in every position the authorisation matrix asks about, plus
 * a chain of another team (whose name must never leak), a library model, an open review request, a
 * comment thread, two revisions and open chain and team invitations.
 */
export function teamWorld() {
  const owner = makeUser("owner");
  const editor = makeUser("editor");
  const reviewer = makeUser("reviewer");
  const viewer = makeUser("viewer"); // outside the team: a share only
  const member = makeUser("member"); // team engineer without a share
  const admin = makeUser("admin");
  const other = makeUser("other"); // admin of another team
  const stranger = makeUser("stranger"); // in nothing at all
  const teamId = makeTeam("Keel", [
    [owner, "engineer"],
    [editor, "engineer"],
    [reviewer, "reviewer"],
    [member, "engineer"],
    [admin, "admin"],
  ]);
  const otherTeamId = makeTeam("Elsewhere", [[other, "admin"]]);
  const otherChainId = makeChain(otherTeamId, other, "Secret other chain");
  const chainId = makeChain(teamId, owner, "Channel A");
  share(chainId, editor, "editor");
  share(chainId, reviewer, "reviewer");
  share(chainId, viewer, "viewer");
  const saved = saveChainWithHistory({
    id: chainId,
    baseVersion: 1,
    name: "Channel A",
    document: { ...draftDocument("Channel A"), notes: "second revision" },
    userId: editor.id,
    worstStatus: null,
  });
  if (!saved.ok) throw new Error("world: save failed");
  requestReview({ chainId, requestedBy: editor.id, reviewerIds: [reviewer.id], note: "" });
  const thread = addComment({ chainId, authorId: reviewer.id, body: "Check the corner", nodeId: null, parentId: null });
  if (!thread.ok) throw new Error("world: comment failed");
  const part = insertPart(teamId, { name: "Generic precision", notes: "", model: { gbw: 1e6, aol: 1e5 } }, owner.id);
  const chainInvite = createInvitation("invitee@test.example", { chainId, teamId, role: "viewer" }, owner.id);
  const teamInvite = createInvitation("joiner@test.example", { chainId: null, teamId, role: "engineer" }, admin.id);
  const revisions = listRevisions(chainId);
  return {
    owner,
    editor,
    reviewer,
    viewer,
    member,
    admin,
    other,
    stranger,
    teamId,
    otherTeamId,
    otherChainId,
    chainId,
    threadId: thread.comment.id,
    partId: part.id,
    chainInvitationId: chainInvite.invitation.id,
    teamInvitationId: teamInvite.invitation.id,
    firstRevisionId: revisions[revisions.length - 1].id,
    lastRevisionId: revisions[0].id,
  };
}

export type TeamWorld = ReturnType<typeof teamWorld>;

export function reloadUser(id: string): User {
  return getDb().select().from(users).all().find((u) => u.id === id)!;
}
