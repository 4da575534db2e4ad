import "server-only";
import { eq } from "drizzle-orm";
import { farmContextStatement, withFarmContext } from "@/db/client";
import { farms, users } from "@/db/schema";
import type { MemberRole } from "@/lib/auth/permissions";

export interface Member {
  id: string;
  email: string;
  name: string;
  role: MemberRole;
  farmId: string | null;
  farmName: string | null;
  active: boolean;
  displayUnits: "metric" | "imperial";
}

/** Reads a member's own row (the `self` policy needs only the user id) and their farm's name. */
export async function loadMember(userId: string): Promise<Member | null> {
  return withFarmContext({ userId, farmId: null, role: null }, async (tx) => {
    const [row] = await tx
      .select({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        farmId: users.farmId,
        active: users.active,
        displayUnits: users.displayUnits,
      })
      .from(users)
      .where(eq(users.id, userId));
    if (!row) return null;
    let farmName: string | null = null;
    if (row.farmId) {
      await tx.execute(farmContextStatement({ userId, farmId: row.farmId, role: row.role }));
      const [farm] = await tx.select({ name: farms.name, status: farms.status }).from(farms).where(eq(farms.id, row.farmId));
      if (!farm || farm.status !== "active") return { ...row, farmName: farm?.name ?? null, active: false };
      farmName = farm.name;
    }
    return { ...row, farmName };
  });
}
