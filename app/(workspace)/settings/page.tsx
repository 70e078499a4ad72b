import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SectionNav } from "@/components/team/section-nav";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { getUserSettings } from "@/db/queries/settings";
import { getCurrentUser } from "@/lib/auth/session";
import { saveNotificationSettings } from "./actions";

export const metadata: Metadata = { title: "Settings" };

type Props = { searchParams: Promise<{ saved?: string }> };

export default async function SettingsPage({ searchParams }: Props) {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/settings");
  const settings = getUserSettings(user.id);
  const { saved } = await searchParams;
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Settings</h1>
        <p className="mt-1 text-sm text-graphite-500">Signed in as {user.email}.</p>
      </div>
      <SectionNav current="/settings" />
      <Card className="max-w-xl p-5">
        <form action={saveNotificationSettings} className="flex flex-col gap-3 text-sm">
          <h2 className="text-base font-semibold text-graphite-950">E-mail notifications</h2>
          <label className="flex items-start gap-2">
            <input type="checkbox" name="notifyOnComments" defaultChecked={settings.notifyOnComments} className="mt-1" />
            <span>
              <span className="font-medium">Comments</span>
              <span className="block text-graphite-500">A mail when someone writes in a thread you take part in, or starts one on a chain you own or edit.</span>
            </span>
          </label>
          <label className="flex items-start gap-2">
            <input type="checkbox" name="notifyOnReviews" defaultChecked={settings.notifyOnReviews} className="mt-1" />
            <span>
              <span className="font-medium">Reviews</span>
              <span className="block text-graphite-500">A mail when you are asked to review a chain, and when a reviewer decides on a review you asked for.</span>
            </span>
          </label>
          <p className="text-graphite-500">Invitations are always mailed: they are how an invitation reaches you.</p>
          <div className="flex items-center gap-3">
            <Button type="submit">Save</Button>
            {saved && (
              <span role="status" className="text-graphite-700">
                ○ Saved.
              </span>
            )}
          </div>
        </form>
      </Card>
    </div>
  );
}
