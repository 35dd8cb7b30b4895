import { eq } from "drizzle-orm";
import { db } from "../db/client";
import { companies } from "../db/schema";
import type { Scope } from "../scope";

export async function companySettingsRow(scope: Scope) {
  const [row] = await db().select().from(companies).where(eq(companies.id, scope.companyId));
  if (!row) throw new Error(`company ${scope.companyId} vanished while signed in`);
  return row;
}
