/**
 * Publishes the demo's finished oyster trial with its analysis, so the demo shows a published
 * report. Runs at the end of the seed: the analysis is the one the app runs when the coordinator
 * closes a trial (lib/data/trials.ts), so only what a report may show is stored.
 */
import { eq } from "drizzle-orm";
import type { NodePgDatabase } from "drizzle-orm/node-postgres";
import { withFarmContext } from "./client";
import * as schema from "./schema";
import { loadMember } from "@/lib/data/members";
import { analyseTrialAsCoordinator } from "@/lib/data/trials";

export async function publishDemoTrial(owner: NodePgDatabase<typeof schema>, code: string, publishedAt: Date): Promise<void> {
  const [trial] = await owner.select().from(schema.trials).where(eq(schema.trials.code, code));
  const coordinatorRow = await owner.query.users.findFirst({ where: (users, { eq: equals }) => equals(users.role, "coordinator") });
  const coordinator = coordinatorRow ? await loadMember(coordinatorRow.id) : null;
  if (!trial || !coordinator) return;
  const results = { ...(await analyseTrialAsCoordinator(coordinator, trial.id)), analysedAt: publishedAt.toISOString() };
  await owner
    .update(schema.trials)
    .set({ status: "published", publishedResults: results, publishedAt })
    .where(eq(schema.trials.id, trial.id));
  // The audit log is append-only and forced under row-level security: write it as the coordinator would.
  await withFarmContext({ userId: coordinator.id, farmId: null, role: "coordinator" }, (tx) =>
    tx.insert(schema.auditEvents).values(
      (["collecting", "published"] as const).map((to, index) => ({
        action: "trial.status_changed",
        subject: code,
        actorUserId: coordinator.id,
        actorLabel: coordinator.name,
        details: { trialId: trial.id, from: index === 0 ? "running" : "collecting", to },
        occurredAt: new Date(publishedAt.getTime() - (1 - index) * 86_400_000),
      })),
    ),
  );
  console.log(
    `  trial ${code}: published with its analysis (${results.analysis.blocksAnalysed} blocks from ${results.analysis.farmsContributing} farms)`,
  );
}
