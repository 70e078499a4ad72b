"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { saveUserSettings } from "@/db/queries/settings";
import { getCurrentUser } from "@/lib/auth/session";

/** Save the notification switches (a checkbox left unticked is absent from the form: off). */
export async function saveNotificationSettings(form: FormData): Promise<void> {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/settings");
  saveUserSettings(user.id, { notifyOnComments: form.get("notifyOnComments") === "on", notifyOnReviews: form.get("notifyOnReviews") === "on" });
  revalidatePath("/settings");
  redirect("/settings?saved=1");
}
