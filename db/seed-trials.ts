/**
 * Publishes the demo's finished oyster trial with its analysis, so the demo shows a published
 * report. Runs at the end of the seed: the analysis is the run the app makes when the coordinator
 * closes a trial (lib/data/trials.ts), so only what a report may show is stored; it is published as version 1.
 */
import { eq, sql } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { withFarmContext } from "./client";
import * as schema from "./schema";
import type { Moment } from "./seed-times";
import { loadMember } from "@/lib/data/members";
import { analyseTrialAsCoordinator } from "@/lib/data/trials";

/** Returns the analysis's moment: its activity entry, stamped now(), belongs to the day the trial closed. */
export async function publishDemoTrial(owner: NodePgDatabase<typeof schema>, code: string, publishedAt: Date): Promise<Moment[]> {
  const [trial] = await owner.select().from(schema.trials).where(eq(schema.trials.code, code));
  const coordinatorRow = await owner.query.users.findFirst({ where: (users, { eq: equals }) => equals(users.role, "coordinator") });
  const coordinator = coordinatorRow ? await loadMember(coordinatorRow.id) : null;
  if (!trial || !coordinator) return [];
  const closedAt = new Date(publishedAt.getTime() - 86_400_000);
  const { id: analysisId, results } = await analyseTrialAsCoordinator(coordinator, trial.id, closedAt);
  await owner.update(schema.trials).set({ status: "published", publishedAt }).where(eq(schema.trials.id, trial.id));
  // The audit log and the published versions are forced under row-level security: write them as the coordinator would.
  await withFarmContext({ userId: coordinator.id, farmId: null, role: "coordinator" }, async (tx) => {
    await tx.insert(schema.trialPublications).values({
      trialId: trial.id,
      analysisId,
      version: 1,
      publishedAt,
      publishedBy: coordinator.id,
      publishedByName: coordinator.name,
    });
    await tx.insert(schema.auditEvents).values(
      (["collecting", "published"] as const).map((to, index) => ({
        action: "trial.status_changed",
        subject: code,
        actorUserId: coordinator.id,
        actorLabel: coordinator.name,
        details:
          index === 0 ? { trialId: trial.id, from: "running", to } : { trialId: trial.id, from: "collecting", to, run: 1, version: 1 },
        occurredAt: index === 0 ? closedAt : publishedAt,
      })),
    );
  });
  console.log(
    `  trial ${code}: published with its analysis (${results.analysis.blocksAnalysed} blocks from ${results.analysis.farmsContributing} farms)`,
  );
  return [
    {
      original: sql`select occurred_at from audit_events where action = 'trial.analysed' and details->>'trialId' = ${trial.id}`,
      at: closedAt,
    },
  ];
}
