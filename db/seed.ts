/**
 * The demo co-op: an invented valley, five invented farms, one sign-in per role. Run by
 * npm start / npm test when the database is empty. Co-op-level rows go in as the owner;
 * each farm's own blocks and harvests go in through withFarmContext, as the app would.
 */
import { count, sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/node-postgres";
import { Pool } from "pg";
import { closeDatabase, withAnalystAccess, withFarmContext } from "./client";
import * as schema from "./schema";
import { publishDemoTrial } from "./seed-trials";
import { hashPassword } from "@/lib/auth/password";
import { cutSetupRelease } from "@/lib/data/pooled-releases";
import { seededRandom, type Random } from "@/lib/random";

export const demoPassword = "alder-valley-demo";

export const demoSignIns = [
  { role: "coordinator", email: "coordinator@aldervalley.example", name: "Maren Holt" },
  { role: "farm_manager", email: "manager@fernbrook.example", name: "Tomas Reyes" },
  { role: "grower", email: "grower@fernbrook.example", name: "Ada Kimura" },
  { role: "observer", email: "observer@extension.example", name: "Ines Walker" },
] as const;

const farmPlans = [
  { name: "Fernbrook Farm", region: "Upper Alder", manager: demoSignIns[1], unit: "kg", effect: 6 },
  {
    name: "Hollow Oak Mushrooms",
    region: "Upper Alder",
    manager: { email: "manager@hollowoak.example", name: "Ruth Okafor" },
    unit: "lb",
    effect: -9,
  },
  {
    name: "Mill Creek Fungi",
    region: "Lower Alder",
    manager: { email: "manager@millcreek.example", name: "Jonas Berg" },
    unit: "g",
    effect: 2,
  },
  {
    name: "Stonebank Growers",
    region: "Lower Alder",
    manager: { email: "manager@stonebank.example", name: "Leila Haddad" },
    unit: "kg",
    effect: -3,
  },
  {
    name: "Wrenfield Farm",
    region: "Alder Heights",
    manager: { email: "manager@wrenfield.example", name: "Piet Vos" },
    unit: "lb",
    effect: 11,
  },
] as const;

const speciesPlans = [
  { key: "oyster", scientificName: "Pleurotus ostreatus", commonName: "Oyster mushroom", meanBe: 72, firstHarvestDays: 24 },
  { key: "lions-mane", scientificName: "Hericium erinaceus", commonName: "Lion's mane", meanBe: 52, firstHarvestDays: 30 },
  { key: "shiitake", scientificName: "Lentinula edodes", commonName: "Shiitake", meanBe: 88, firstHarvestDays: 84 },
] as const;

const strainPlans = [
  { code: "PO-01", species: "oyster", name: "Grey Morning", source: "culture_bank", effect: 0 },
  { code: "PO-02", species: "oyster", name: "Valley Wild", source: "wild_clone", effect: 9 },
  { code: "PO-03", species: "oyster", name: "Slate Blue", source: "culture_bank", effect: -5 },
  { code: "HE-01", species: "lions-mane", name: "Snowdrift", source: "culture_bank", effect: 0 },
  { code: "HE-02", species: "lions-mane", name: "Beech Hollow", source: "wild_clone", effect: 6 },
  { code: "HE-03", species: "lions-mane", name: "Fernbrook Isolate 4", source: "own_isolate", effect: -4 },
  { code: "LE-01", species: "shiitake", name: "Cold Spring", source: "culture_bank", effect: 0 },
  { code: "LE-02", species: "shiitake", name: "Warm Log", source: "culture_bank", effect: 7 },
] as const;

// Typical shares of a block's total yield by flush: the first flush is the largest (common practice).
const flushShares = [0.5, 0.3, 0.14, 0.06];

const gramsPer = { g: 1, kg: 1000, lb: 453.59237 } as const;

function asWritten(grams: number, unit: keyof typeof gramsPer) {
  const value = grams / gramsPer[unit];
  const text = unit === "g" ? value.toFixed(0) : value.toFixed(unit === "kg" ? 3 : 2);
  return { grams: Number((Number(text) * gramsPer[unit]).toFixed(3)), asWritten: `${text} ${unit}`, unit };
}

function addDays(isoDate: string, days: number): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

interface BlockPlan {
  block: typeof schema.blocks.$inferInsert;
  harvests: Omit<typeof schema.harvests.$inferInsert, "blockId" | "farmId">[];
}

function planBlock(
  random: Random,
  code: string,
  farm: (typeof farmPlans)[number],
  strain: { id: string; effect: number; species: (typeof speciesPlans)[number] },
  ids: { farmId: string; recipeId: string; fruitingMethodId: string; trialArmId?: string },
  inoculatedOn: string,
  today: string,
): BlockPlan {
  const wet = asWritten(random.integer(2300, 2800), farm.unit);
  const moisture = Number((0.6 + random.next() * 0.05).toFixed(3));
  const dryGrams = wet.grams * (1 - moisture);
  const contaminated = random.next() < 0.04;
  const targetBe = Math.max(15, random.normal(strain.species.meanBe + strain.effect + farm.effect, 12));
  const totalFresh = (dryGrams * targetBe) / 100;
  const flushCount = random.integer(2, 4);
  const shares = flushShares.slice(0, flushCount);
  const shareSum = shares.reduce((sum, share) => sum + share, 0);

  const harvests: BlockPlan["harvests"] = [];
  let harvestedOn = addDays(inoculatedOn, strain.species.firstHarvestDays + random.integer(-3, 6));
  const lastFlush = contaminated ? random.integer(0, 1) : flushCount;
  for (let flush = 1; flush <= lastFlush && harvestedOn <= today; flush++) {
    const fresh = asWritten(Math.max(20, ((totalFresh * shares[flush - 1]) / shareSum) * random.normal(1, 0.08)), farm.unit);
    harvests.push({ flush, harvestedOn, freshMassG: fresh.grams, freshMassAsWritten: fresh.asWritten, freshMassUnit: fresh.unit });
    harvestedOn = addDays(harvestedOn, random.integer(12, 18));
  }
  const finished = !contaminated && harvests.length === flushCount && harvestedOn <= today;
  const picked = harvests.reduce((sum, harvest) => sum + harvest.freshMassG, 0);
  // A spent block has lost what it fruited plus water and the carbon breathed out as CO2.
  const spent = finished ? asWritten(wet.grams - picked - wet.grams * (0.08 + random.next() * 0.1), farm.unit) : null;
  return {
    block: {
      farmId: ids.farmId,
      code,
      strainId: strain.id,
      substrateRecipeId: ids.recipeId,
      fruitingMethodId: ids.fruitingMethodId,
      trialArmId: ids.trialArmId,
      inoculatedOn,
      wetMassG: wet.grams,
      wetMassAsWritten: wet.asWritten,
      wetMassUnit: wet.unit,
      moisture,
      contaminated,
      contaminatedOn: contaminated ? addDays(inoculatedOn, random.integer(6, 20)) : null,
      spentMassG: spent?.grams ?? null,
      spentMassAsWritten: spent?.asWritten ?? null,
      spentMassUnit: spent?.unit ?? null,
    },
    harvests,
  };
}

export async function seedDemo(ownerUrl: string, today = new Date().toISOString().slice(0, 10)): Promise<void> {
  const pool = new Pool({ connectionString: ownerUrl, max: 2 });
  const owner = drizzle(pool, { schema });
  try {
    const [{ farmCount }] = await owner.select({ farmCount: count() }).from(schema.farms);
    if (farmCount > 0) {
      console.log("  the database already has farms: leaving it as it is");
      return;
    }
    const random = seededRandom("alder-valley-2026");
    const passwordHash = await hashPassword(demoPassword);

    await owner
      .insert(schema.cooperativeSettings)
      .values({ name: "Alder Valley Growers' Co-operative", region: "Alder Valley", minimumFarms: 3 });
    const farms = await owner
      .insert(schema.farms)
      .values(farmPlans.map((farm) => ({ name: farm.name, region: farm.region, contactEmail: farm.manager.email })))
      .returning();
    await owner.insert(schema.users).values([
      { email: demoSignIns[0].email, name: demoSignIns[0].name, role: "coordinator", passwordHash },
      { email: demoSignIns[3].email, name: demoSignIns[3].name, role: "observer", passwordHash },
      { email: demoSignIns[2].email, name: demoSignIns[2].name, role: "grower", farmId: farms[0].id, passwordHash },
      ...farmPlans.map((farm, index) => ({
        email: farm.manager.email,
        name: farm.manager.name,
        role: "farm_manager" as const,
        farmId: farms[index].id,
        passwordHash,
      })),
    ]);

    const species = await owner
      .insert(schema.species)
      .values(speciesPlans.map(({ scientificName, commonName }) => ({ scientificName, commonName })))
      .returning();
    const speciesByKey = new Map(speciesPlans.map((plan, index) => [plan.key, { row: species[index], plan }]));
    const strains = await owner
      .insert(schema.strains)
      .values(
        strainPlans.map((strain) => ({
          code: strain.code,
          name: strain.name,
          source: strain.source,
          speciesId: speciesByKey.get(strain.species)!.row.id,
        })),
      )
      .returning();
    const strainByCode = new Map(
      strainPlans.map((plan, index) => [
        plan.code,
        { id: strains[index].id, effect: plan.effect, species: speciesByKey.get(plan.species)!.plan },
      ]),
    );
    const [sawdustBran, sawdustSoy] = await owner
      .insert(schema.substrateRecipes)
      .values([
        {
          code: "HWB-20",
          name: "Hardwood sawdust with 20 % wheat bran",
          base: "Hardwood sawdust",
          supplement: "Wheat bran",
          supplementPercent: 20,
          targetMoisture: 0.62,
          treatment: "sterilised",
        },
        {
          code: "HWS-50",
          name: "Hardwood pellets and soybean hulls, half and half",
          base: "Hardwood fuel pellets",
          supplement: "Soybean hulls",
          supplementPercent: 50,
          targetMoisture: 0.6,
          treatment: "sterilised",
        },
      ])
      .returning();
    const [slitsAcross, slitsAlong, topOpen] = await owner
      .insert(schema.treatments)
      .values([
        {
          code: "SLIT-ACROSS",
          name: "Slits cut across the bag",
          kind: "fruiting_method",
          description: "Three short cuts across the bag face.",
        },
        {
          code: "SLIT-ALONG",
          name: "Slits cut along the bag",
          kind: "fruiting_method",
          description: "Three short cuts along the bag's length.",
        },
        { code: "TOP-OPEN", name: "Bag opened at the top", kind: "fruiting_method", description: "The bag folded down above the block." },
        {
          code: "HUMID-90",
          name: "Humidity held at 90 % or more",
          kind: "humidity",
          description: "Fruiting room humidity kept at or above 90 %.",
        },
      ])
      .returning();

    const coordinator = await owner.query.users.findFirst({ where: (users, { eq }) => eq(users.role, "coordinator") });
    const [finishedTrial, enrollingTrial, crossedTrial] = await owner
      .insert(schema.trials)
      .values([
        {
          code: "T-2026-01",
          title: "Which oyster strain gives the most over two flushes?",
          question: "Do PO-02 and PO-03 give a different biological efficiency over flushes 1–2 than PO-01 on HWB-20?",
          speciesId: speciesByKey.get("oyster")!.row.id,
          status: "collecting",
          outcomeFlushes: 2,
          contaminatedHandling: "exclude",
          protocolNotes: "2.5 kg blocks of HWB-20 at 62 % moisture, 5 % spawn by wet mass, fruited with slits across the bag.",
          // The trial's blocks were inoculated on day 20 of the season (below).
          inoculationFrom: addDays(today, -185),
          inoculationTo: addDays(today, -175),
          fruitingFrom: addDays(today, -160),
          fruitingTo: addDays(today, -80),
          dataDue: addDays(today, -50),
          smallestDifference: 10,
          expectedSd: 14,
          plannedFarms: 4,
          expectedLoss: 0.05,
          createdBy: coordinator?.id,
        },
        {
          code: "T-2026-02",
          title: "Slits across or along the bag for lion's mane?",
          question: "Does cutting slits along the bag change lion's mane biological efficiency over two flushes?",
          speciesId: speciesByKey.get("lions-mane")!.row.id,
          status: "open",
          outcomeFlushes: 2,
          contaminatedHandling: "count_as_zero",
          protocolNotes: "HE-01 on HWB-20, 2.5 kg blocks; humidity held at 90 % or more.",
          enrolmentDeadline: addDays(today, 21),
          inoculationFrom: addDays(today, 28),
          inoculationTo: addDays(today, 42),
          fruitingFrom: addDays(today, 63),
          fruitingTo: addDays(today, 120),
          dataDue: addDays(today, 135),
          smallestDifference: 8,
          expectedSd: 12,
          plannedFarms: 5,
          expectedLoss: 0.08,
          createdBy: coordinator?.id,
        },
        {
          // A draft crossing two strains with two fruiting methods, for the coordinator to open (no blocks yet).
          code: "T-2026-03",
          title: "Slits or an opened top, for PO-01 and PO-02?",
          question: "Do slits across the bag give more BE over two flushes than an opened top, and does the answer depend on the strain?",
          speciesId: speciesByKey.get("oyster")!.row.id,
          status: "draft",
          designKind: "strain_by_method",
          outcomeFlushes: 2,
          contaminatedHandling: "exclude",
          protocolNotes: "2.5 kg blocks of HWB-20 at 62 % moisture, 5 % spawn by wet mass.",
          smallestDifference: 8,
          expectedSd: 12,
          plannedFarms: 4,
          expectedLoss: 0.05,
          createdBy: coordinator?.id,
        },
      ])
      .returning();
    const trialArms = await owner
      .insert(schema.trialArms)
      .values([
        {
          trialId: finishedTrial.id,
          label: "A",
          strainId: strainByCode.get("PO-01")!.id,
          treatmentId: slitsAcross.id,
          isReference: true,
          position: 1,
        },
        { trialId: finishedTrial.id, label: "B", strainId: strainByCode.get("PO-02")!.id, treatmentId: slitsAcross.id, position: 2 },
        { trialId: finishedTrial.id, label: "C", strainId: strainByCode.get("PO-03")!.id, treatmentId: slitsAcross.id, position: 3 },
        {
          trialId: enrollingTrial.id,
          label: "Across",
          strainId: strainByCode.get("HE-01")!.id,
          treatmentId: slitsAcross.id,
          isReference: true,
          position: 1,
        },
        { trialId: enrollingTrial.id, label: "Along", strainId: strainByCode.get("HE-01")!.id, treatmentId: slitsAlong.id, position: 2 },
        ...(["PO-01", "PO-02"] as const).flatMap((strainCode, i) =>
          [slitsAcross, topOpen].map((method, j) => ({
            trialId: crossedTrial.id,
            label: String.fromCharCode(65 + 2 * i + j),
            strainId: strainByCode.get(strainCode)!.id,
            treatmentId: method.id,
            isReference: i === 0 && j === 0,
            position: 2 * i + j + 1,
          })),
        ),
      ])
      .returning();
    const finishedArms = trialArms.slice(0, 3);
    const trialStrainCodes = ["PO-01", "PO-02", "PO-03"] as const;

    const seasonStart = addDays(today, -200);
    for (const [farmIndex, farm] of farmPlans.entries()) {
      const farmId = farms[farmIndex].id;
      const manager = await owner.query.users.findFirst({ where: (users, { eq }) => eq(users.email, farm.manager.email) });
      const inTrial = farmIndex < 4;
      await withFarmContext({ userId: manager!.id, farmId, role: "farm_manager" }, async (tx) => {
        if (inTrial) {
          const [enrolment] = await tx
            .insert(schema.trialEnrolments)
            .values({
              trialId: finishedTrial.id,
              farmId,
              status: "accepted",
              blocksPerArm: 6,
              randomisationSeed: `T-2026-01/${farmIndex + 1}`,
              respondedAt: new Date(),
            })
            .returning();
          const assignments = random.shuffle(Array.from({ length: 18 }, (_, index) => index % 3)).map((armIndex, sequence) => ({
            trialId: finishedTrial.id,
            farmId,
            enrolmentId: enrolment.id,
            armId: finishedArms[armIndex].id,
            blockCode: `T01-${String(farmIndex + 1)}-${String(sequence + 1).padStart(2, "0")}`,
            sequence: sequence + 1,
            permutedBlock: Math.floor(sequence / 3) + 1,
          }));
          await tx.insert(schema.trialBlockAssignments).values(assignments);
        }

        const plans: BlockPlan[] = [];
        let blockNumber = 0;
        for (const strain of strainPlans) {
          const blockCount = random.integer(6, 14);
          for (let index = 0; index < blockCount; index++) {
            blockNumber++;
            const inoculatedOn = addDays(seasonStart, random.integer(0, 170));
            const recipeId = strain.species === "shiitake" ? sawdustSoy.id : sawdustBran.id;
            plans.push(
              planBlock(
                random,
                `${farm.name.slice(0, 2).toUpperCase()}-${String(blockNumber).padStart(3, "0")}`,
                farm,
                strainByCode.get(strain.code)!,
                { farmId, recipeId, fruitingMethodId: slitsAcross.id },
                inoculatedOn,
                today,
              ),
            );
          }
        }
        if (inTrial) {
          const assignments = await tx.select().from(schema.trialBlockAssignments);
          for (const assignment of assignments) {
            const arm = finishedArms.findIndex((candidate) => candidate.id === assignment.armId);
            plans.push(
              planBlock(
                random,
                assignment.blockCode,
                farm,
                strainByCode.get(trialStrainCodes[arm])!,
                { farmId, recipeId: sawdustBran.id, fruitingMethodId: slitsAcross.id, trialArmId: assignment.armId },
                addDays(seasonStart, 20),
                today,
              ),
            );
          }
        }
        const inserted = await tx
          .insert(schema.blocks)
          .values(plans.map((plan) => plan.block))
          .returning({ id: schema.blocks.id });
        const harvestRows = plans.flatMap((plan, index) =>
          plan.harvests.map((harvest) => ({ ...harvest, blockId: inserted[index].id, farmId })),
        );
        if (harvestRows.length) await tx.insert(schema.harvests).values(harvestRows);
        console.log(`  ${farm.name}: ${plans.length} blocks, ${harvestRows.length} harvests`);
      });
    }
    // The co-op's pooled statistics, as the analyst role computes them after each upload, and
    // their first release, so the demo's Co-op results have figures to show.
    await withAnalystAccess((tx) => tx.execute(sql`select pooled_refresh_all()`));
    const release = await cutSetupRelease();
    console.log(`  pooled figures: ${release.outcome === "cut" ? `release ${release.release.number}` : release.outcome}`);
    await publishDemoTrial(owner, "T-2026-01", new Date(`${today}T09:00:00Z`));
    await (await import("./seed-rooms")).seedDemoRooms(owner, today);
  } finally {
    await pool.end();
  }
}

const isMain = process.argv[1]?.endsWith("seed.ts");
if (isMain) {
  const url = process.env.OWNER_DATABASE_URL;
  if (!url) throw new Error("OWNER_DATABASE_URL is not set: run this through npm start or npm test");
  await seedDemo(url);
  await closeDatabase();
}
