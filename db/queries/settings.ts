import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "../connection";
import { userSettings } from "../schema";

export interface NotificationSettings {
  notifyOnComments: boolean;
  notifyOnReviews: boolean;
}

/** A user's settings; users without a row get the defaults (every notification on). */
export function getUserSettings(userId: string): NotificationSettings {
  const row = getDb().select().from(userSettings).where(eq(userSettings.userId, userId)).get();
  return { notifyOnComments: row?.notifyOnComments ?? true, notifyOnReviews: row?.notifyOnReviews ?? true };
}

export function saveUserSettings(userId: string, settings: NotificationSettings): NotificationSettings {
  getDb()
    .insert(userSettings)
    .values({ userId, ...settings })
    .onConflictDoUpdate({ target: userSettings.userId, set: settings })
    .run();
  return settings;
}
