import { and, eq } from "drizzle-orm";
import { users, type Role } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { startSession } from "~/lib/auth/session.server";

/** A session cookie for the first user of a company with the role. */
export async function loginAs(companyId: number, role: Role): Promise<string> {
  const [user] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, role)))
    .limit(1);
  if (!user) throw new Error(`no ${role} in company ${companyId}`);
  return (await startSession(user.id)).split(";")[0]!;
}
