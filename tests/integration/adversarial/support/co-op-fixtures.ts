import { randomUUID } from "node:crypto";
import type { Pool } from "pg";
import { loadMember, type Member } from "@/lib/data/members";

/**
 * Invented farms, a species of their own and hand-made blocks, written by the superuser so an
 * attack can be set up exactly. Everything a fixture makes is removed by `dispose()`; the demo
 * co-op is left as it was.
 */
export interface FixtureBlock {
  /** Wet block mass in grams and moisture (wet basis): dry substrate = wet × (1 − moisture). */
  wetG?: number;
  moisture?: number;
  /** Fresh grams per flush, flush 1 first; none = the block has not fruited yet. */
  flushes?: number[];
  /** Grams of each flush after drying, where the farm dried it (same order as `flushes`). */
  dried?: number[];
  contaminated?: boolean;
  contaminatedOn?: string | null;
  spentG?: number | null;
  inoculatedOn?: string;
  recipeId?: string | null;
  methodId?: string | null;
  trialArmId?: string | null;
}

export class CoopFixture {
  readonly run = randomUUID().slice(0, 8).toUpperCase();
  readonly farmIds: string[] = [];
  private readonly speciesIds: string[] = [];
  private readonly recipeIds: string[] = [];
  private readonly methodIds: string[] = [];
  private readonly trialIds: string[] = [];
  private blockNumber = 0;

  constructor(readonly pool: Pool) {}

  async farm(label: string): Promise<{ id: string; manager: Member }> {
    const {
      rows: [farm],
    } = await this.pool.query<{ id: string }>("insert into farms (name) values ($1) returning id", [`${label} ${this.run}`]);
    this.farmIds.push(farm.id);
    const {
      rows: [user],
    } = await this.pool.query<{ id: string }>(
      "insert into users (email, name, role, farm_id) values ($1, $2, 'farm_manager', $3) returning id",
      [`manager-${label.toLowerCase().replace(/\W+/g, "-")}-${this.run.toLowerCase()}@fixture.example`, `Manager of ${label}`, farm.id],
    );
    return { id: farm.id, manager: (await loadMember(user.id))! };
  }

  async species(name: string, strainNames: string[]): Promise<{ id: string; strainIds: string[] }> {
    const {
      rows: [species],
    } = await this.pool.query<{ id: string }>("insert into species (scientific_name, common_name) values ($1, $2) returning id", [
      `Fixturus ${name.toLowerCase()} ${this.run.toLowerCase()}`,
      `${name} ${this.run}`,
    ]);
    this.speciesIds.push(species.id);
    const strainIds: string[] = [];
    for (const [index, strainName] of strainNames.entries()) {
      const {
        rows: [strain],
      } = await this.pool.query<{ id: string }>(
        "insert into strains (code, species_id, name, source) values ($1, $2, $3, 'culture_bank') returning id",
        [`FX-${this.run}-${this.speciesIds.length}${index}`, species.id, strainName],
      );
      strainIds.push(strain.id);
    }
    return { id: species.id, strainIds };
  }

  async recipe(name: string): Promise<string> {
    const {
      rows: [recipe],
    } = await this.pool.query<{ id: string }>(
      "insert into substrate_recipes (code, name, base, target_moisture, treatment) values ($1, $2, 'Hardwood sawdust', 0.6, 'sterilised') returning id",
      [`FXR-${this.run}-${this.recipeIds.length}`, `${name} ${this.run}`],
    );
    this.recipeIds.push(recipe.id);
    return recipe.id;
  }

  async method(name: string): Promise<string> {
    const {
      rows: [method],
    } = await this.pool.query<{ id: string }>("insert into treatments (code, name, kind) values ($1, $2, 'fruiting_method') returning id", [
      `FXM-${this.run}-${this.methodIds.length}`,
      `${name} ${this.run}`,
    ]);
    this.methodIds.push(method.id);
    return method.id;
  }

  /** Blocks of one strain on one farm; returns their ids. Defaults: 2 500 g at 60 % moisture (1 000 g dry). */
  async blocks(farmId: string, strainId: string, blocks: FixtureBlock[]): Promise<string[]> {
    const ids: string[] = [];
    for (const block of blocks) {
      this.blockNumber++;
      const {
        rows: [made],
      } = await this.pool.query<{ id: string }>(
        `insert into blocks (farm_id, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, wet_mass_g, moisture,
           inoculated_on, contaminated, spent_mass_g, contaminated_on)
         values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12) returning id`,
        [
          farmId,
          `FX-${this.blockNumber}`,
          strainId,
          block.recipeId ?? null,
          block.methodId ?? null,
          block.trialArmId ?? null,
          block.wetG ?? 2500,
          block.moisture ?? 0.6,
          block.inoculatedOn ?? "2026-01-05",
          block.contaminated ?? false,
          block.spentG ?? null,
          block.contaminatedOn ?? null,
        ],
      );
      for (const [index, fresh] of (block.flushes ?? []).entries()) {
        await this.pool.query(
          `insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g, dry_mass_g)
           values ($1, $2, $3, date '2026-02-01' + $4::int, $5, $6)`,
          [farmId, made.id, index + 1, 14 * index, fresh, block.dried?.[index] ?? null],
        );
      }
      ids.push(made.id);
    }
    return ids;
  }

  /** A climate regime kind in the co-op's register (a treatment of kind "humidity"). */
  async regimeKind(name: string): Promise<string> {
    const {
      rows: [kind],
    } = await this.pool.query<{ id: string }>("insert into treatments (code, name, kind) values ($1, $2, 'humidity') returning id", [
      `FXH-${this.run}-${this.methodIds.length}`,
      `${name} ${this.run}`,
    ]);
    this.methodIds.push(kind.id);
    return kind.id;
  }

  /** A fruiting room run under each regime from its date on; returns the room's id. */
  async room(farmId: string, regimes: { startsOn: string; regimeKindId: string }[]): Promise<string> {
    this.blockNumber++;
    const {
      rows: [room],
    } = await this.pool.query<{ id: string }>(
      "insert into fruiting_rooms (farm_id, name, kind, fresh_air) values ($1, $2, 'tent', 'fan_timer') returning id",
      [farmId, `Tent ${this.blockNumber}`],
    );
    for (const regime of regimes) {
      await this.pool.query(
        `insert into room_regimes (farm_id, room_id, starts_on, regime_kind_id, humidity_mode, flood_starts_at, flood_hours)
         values ($1, $2, $3, $4, 'flooding', '07:00', 2)`,
        [farmId, room.id, regime.startsOn, regime.regimeKindId],
      );
    }
    return room.id;
  }

  /** Puts blocks in a room from a day on (null: from the start of fruiting, as a season log says it). */
  async move(farmId: string, blockIds: string[], roomId: string, movedOn: string | null = null): Promise<void> {
    for (const blockId of blockIds) {
      await this.pool.query("insert into block_room_moves (farm_id, block_id, room_id, moved_on) values ($1, $2, $3, $4)", [
        farmId,
        blockId,
        roomId,
        movedOn,
      ]);
    }
  }

  /** A trial already running, with the farms enrolled and accepted, for tests of what its report publishes. */
  async runningTrial(speciesId: string, arms: { label: string; strainId: string; reference?: boolean }[], farmIds: string[]) {
    const {
      rows: [trial],
    } = await this.pool.query<{ id: string }>(
      `insert into trials (code, title, species_id, status, outcome_flushes, contaminated_handling)
       values ($1, $2, $3, 'running', 2, 'exclude') returning id`,
      [`T-FX-${this.run}-${this.trialIds.length}`, `Fixture trial ${this.run}`, speciesId],
    );
    this.trialIds.push(trial.id);
    const armIds: string[] = [];
    for (const [index, arm] of arms.entries()) {
      const {
        rows: [made],
      } = await this.pool.query<{ id: string }>(
        "insert into trial_arms (trial_id, label, strain_id, is_reference, position) values ($1, $2, $3, $4, $5) returning id",
        [trial.id, arm.label, arm.strainId, arm.reference ?? index === 0, index + 1],
      );
      armIds.push(made.id);
    }
    for (const farmId of farmIds) {
      await this.pool.query(
        "insert into trial_enrolments (trial_id, farm_id, status, blocks_per_arm, responded_at) values ($1, $2, 'accepted', 4, now())",
        [trial.id, farmId],
      );
    }
    return { id: trial.id, armIds };
  }

  /** Removes every row the fixture made (blocks, harvests and statistics go with their farms). */
  async dispose(): Promise<void> {
    await this.pool.query("delete from trial_enrolments where trial_id = any($1)", [this.trialIds]);
    await this.pool.query("delete from blocks where farm_id = any($1)", [this.farmIds]);
    await this.pool.query("delete from trial_arms where trial_id = any($1)", [this.trialIds]);
    await this.pool.query("delete from trials where id = any($1)", [this.trialIds]);
    await this.pool.query("delete from users where farm_id = any($1)", [this.farmIds]);
    await this.pool.query("delete from farms where id = any($1)", [this.farmIds]);
    await this.pool.query("delete from strains where species_id = any($1)", [this.speciesIds]);
    await this.pool.query("delete from species where id = any($1)", [this.speciesIds]);
    await this.pool.query("delete from substrate_recipes where id = any($1)", [this.recipeIds]);
    await this.pool.query("delete from treatments where id = any($1)", [this.methodIds]);
  }
}

/** BE (%) of a fixture block: fresh ÷ dry substrate × 100. */
export function fixtureEfficiency(block: FixtureBlock): number {
  const fresh = (block.flushes ?? []).reduce((sum, grams) => sum + grams, 0);
  return (100 * fresh) / ((block.wetG ?? 2500) * (1 - (block.moisture ?? 0.6)));
}

export const mean = (values: number[]) => values.reduce((sum, value) => sum + value, 0) / values.length;
