/**
 * Publishes the demo's finished oyster trial with its analysis, so the demo shows a published
 * report. Runs at the end of the seed: the trial's rows are read through the analyst role,
 * as the app does when a trial closes, and only the aggregate result is stored.
 */
import { eq, inArray } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { withAnalystAccess, withFarmContext } from "./client";
import * as schema from "./schema";
import { analyseTrial, trialOutcomeRecords, type StoredTrialResults } from "@/lib/trials";

export async function publishDemoTrial(owner: NodePgDatabase<typeof schema>, code: string, publishedAt: Date): Promise<void> {
  const [trial] = await owner.select().from(schema.trials).where(eq(schema.trials.code, code));
  if (!trial) return;
  const arms = await owner.select().from(schema.trialArms).where(eq(schema.trialArms.trialId, trial.id)).orderBy(schema.trialArms.position);
  const coordinator = await owner.query.users.findFirst({ where: (users, { eq: equals }) => equals(users.role, "coordinator") });
  const { analysis, blocksMade, enrolments } = await withAnalystAccess(async (tx) => {
    const [settings] = await tx.select({ minimumFarms: schema.cooperativeSettings.minimumFarms }).from(schema.cooperativeSettings);
    const blockRows = await tx
      .select({
        id: schema.blocks.id,
        farmId: schema.blocks.farmId,
        armId: schema.blocks.trialArmId,
        wetMassG: schema.blocks.wetMassG,
        moisture: schema.blocks.moisture,
        contaminated: schema.blocks.contaminated,
      })
      .from(schema.blocks)
      .where(
        inArray(
          schema.blocks.trialArmId,
          arms.map((arm) => arm.id),
        ),
      );
    const harvestRows = await tx
      .select({ blockId: schema.harvests.blockId, flush: schema.harvests.flush, freshMassG: schema.harvests.freshMassG })
      .from(schema.harvests)
      .where(
        inArray(
          schema.harvests.blockId,
          blockRows.map((row) => row.id),
        ),
      );
    const records = trialOutcomeRecords(blockRows, harvestRows, {
      flushes: trial.outcomeFlushes,
      contaminatedHandling: trial.contaminatedHandling,
    });
    const enrolmentRows = await tx
      .select({ status: schema.trialEnrolments.status })
      .from(schema.trialEnrolments)
      .where(eq(schema.trialEnrolments.trialId, trial.id));
    return {
      analysis: analyseTrial({ arms, records, minimumFarms: settings?.minimumFarms ?? 3 }),
      blocksMade: blockRows.length,
      enrolments: enrolmentRows,
    };
  });
  const results: StoredTrialResults = {
    analysis,
    deviations: {
      farmsDropped: enrolments.filter((row) => row.status === "dropped").length,
      farmsDeclined: enrolments.filter((row) => row.status === "declined").length,
      // The demo lists 6 blocks per arm on every enrolled farm.
      blocksAssigned: enrolments.filter((row) => row.status === "accepted").length * 6 * arms.length,
      blocksMade,
      blocksLeftOut: analysis.blocksLeftOut,
    },
    analysedAt: publishedAt.toISOString(),
  };
  await owner
    .update(schema.trials)
    .set({ status: "published", publishedResults: results, publishedAt })
    .where(eq(schema.trials.id, trial.id));
  // The audit log is append-only and forced under row-level security: write it as the coordinator would.
  await withFarmContext({ userId: coordinator?.id ?? null, farmId: null, role: "coordinator" }, (tx) =>
    tx.insert(schema.auditEvents).values(
      (["collecting", "published"] as const).map((to, index) => ({
        action: "trial.status_changed",
        subject: code,
        actorUserId: coordinator?.id,
        actorLabel: coordinator?.name ?? "",
        details: { trialId: trial.id, from: index === 0 ? "running" : "collecting", to },
        occurredAt: new Date(publishedAt.getTime() - (1 - index) * 86_400_000),
      })),
    ),
  );
  console.log(`  trial ${code}: published with its analysis (${analysis.blocksAnalysed} blocks from ${analysis.farmsContributing} farms)`);
}
