import { asc, eq } from "drizzle-orm";
import { db } from "../../db/client";
import { memberships, user } from "../../db/schema";
import type { Scope } from "../../scope";

export async function companyMembers(scope: Scope) {
  return db()
    .select({ userId: user.id, name: user.name, email: user.email, role: memberships.role, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .where(eq(memberships.companyId, scope.companyId))
    .orderBy(asc(memberships.role), asc(user.name));
}
