"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { saveUserSettings } from "@/db/queries/settings";
import { getCurrentUser } from "@/lib/auth/session";

/** Save the notification switches (a checkbox left unticked is absent from the form: off). */
export async function saveNotificationSettings(form: FormData): Promise<void> {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/settings");
  // a forged call without the form changes nothing (the page's own form always sends one)
  if (!(form instanceof FormData)) redirect("/settings");
  saveUserSettings(user.id, { notifyOnComments: form.get("notifyOnComments") === "on", notifyOnReviews: form.get("notifyOnReviews") === "on" });
  revalidatePath("/settings");
  redirect("/settings?saved=1");
}
