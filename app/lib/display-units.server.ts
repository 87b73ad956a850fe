// A person's display unit choice (account page), read by the pages that show results.
import { eq } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { userPreferences } from "~/db/schema";
import { DISPLAY_UNIT_CHOICES, isDisplayUnitChoice, type DisplayUnitChoice } from "~/lib/format";

export async function getDisplayUnits(userId: string, database: Db = defaultDb()): Promise<DisplayUnitChoice> {
  const [row] = await database.select({ displayUnits: userPreferences.displayUnits }).from(userPreferences).where(eq(userPreferences.userId, userId)).limit(1);
  return row && isDisplayUnitChoice(row.displayUnits) ? row.displayUnits : "model";
}

/** Stores the choice; an unknown one is refused with the choices named, nothing stored. */
export async function setDisplayUnits(userId: string, choice: string, database: Db = defaultDb()): Promise<{ ok: true } | { ok: false; error: string }> {
  if (!isDisplayUnitChoice(choice)) return { ok: false, error: `Choose one of: ${Object.values(DISPLAY_UNIT_CHOICES).map((c) => c.label).join("; ")}` };
  await database
    .insert(userPreferences)
    .values({ userId, displayUnits: choice, updatedAt: new Date() })
    .onConflictDoUpdate({ target: userPreferences.userId, set: { displayUnits: choice, updatedAt: new Date() } });
  return { ok: true };
}
