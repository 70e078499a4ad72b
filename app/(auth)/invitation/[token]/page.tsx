import type { Metadata } from "next";
import Link from "next/link";
import { AcceptInvitation, InvitationSignUp } from "@/components/sharing/invitation-sign-up";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { findInvitationByToken } from "@/db/queries/invitations";
import { findUserByEmail } from "@/db/queries/users";
import { getCurrentUser } from "@/lib/auth/session";
import { signOutAction } from "@/app/(workspace)/actions";

export const metadata: Metadata = { title: "Invitation" };
export const dynamic = "force-dynamic";

const ROLE = { owner: "owner", editor: "editor", reviewer: "reviewer", viewer: "viewer", admin: "admin", engineer: "engineer" } as Record<string, string>;

type Props = { params: Promise<{ token: string }> };

export default async function InvitationPage({ params }: Props) {
  const { token } = await params;
  const view = findInvitationByToken(token);
  if (!view || view.state !== "open") {
    const title = !view ? "This invitation link is not valid" : view.state === "used" ? "This invitation has been used" : "This invitation has expired";
    return (
      <div className="flex flex-col gap-5">
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">{title}</h1>
        <p className="text-sm text-graphite-700">
          {!view
            ? "Check that the whole link was copied from the mail."
            : view.state === "used"
              ? "Each invitation link works once. If it was you who used it, sign in and the chain or team is in your list."
              : "Invitation links work for 7 days. Ask whoever invited you to send a new one."}
        </p>
        <p className="text-sm">
          <Link href="/sign-in">Sign in</Link>
        </p>
      </div>
    );
  }
  const inv = view.invitation;
  const what = inv.chainId ? `the chain “${view.chainName}”` : `the team “${view.teamName}”`;
  const user = await getCurrentUser();
  const callback = `/invitation/${token}`;
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">You are invited</h1>
      <p className="text-sm text-graphite-700" data-testid="invitation-what">
        {view.invitedByName ?? "A colleague"} invited <strong>{inv.email}</strong> to {what} as {ROLE[inv.role] ?? inv.role}.
      </p>
      <Card className="p-6">
        {user ? (
          user.email === inv.email ? (
            <AcceptInvitation token={token} />
          ) : (
            <div className="flex flex-col gap-3 text-sm">
              <Notice tone="caution" title="Another address">
                You are signed in as {user.email}, but this invitation is for {inv.email}. Sign out, then open the link again and sign in with
                that address.
              </Notice>
              <form action={signOutAction}>
                <Button type="submit" variant="secondary">
                  Sign out
                </Button>
              </form>
            </div>
          )
        ) : findUserByEmail(inv.email) ? (
          <div className="flex flex-col gap-3 text-sm">
            <p>{inv.email} already has an account. Sign in with it to accept.</p>
            <Link href={`/sign-in?callbackUrl=${encodeURIComponent(callback)}`} className="font-medium">
              Sign in to accept
            </Link>
          </div>
        ) : (
          <InvitationSignUp token={token} email={inv.email} />
        )}
      </Card>
    </div>
  );
}
