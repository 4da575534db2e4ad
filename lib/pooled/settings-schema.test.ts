import { describe, expect, it } from "vitest";
import { cooperativeSettingsSchema } from "./settings-schema";

const form = (fields: Record<string, string>) => ({
  showPerFarmEstimates: undefined,
  releaseSchedule: "daily",
  releaseHour: "2",
  ...fields,
});

describe("the Co-op settings form", () => {
  it("refuses a minimum below 3 farms, saying why", () => {
    const parsed = cooperativeSettingsSchema.safeParse(form({ minimumFarms: "2" }));
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0].message).toMatch(/At least 3 farms: with 2, each of the two farms would learn the other's figures/);
  });

  it("takes 3 farms and a nightly schedule, and refuses an hour that is not one", () => {
    expect(cooperativeSettingsSchema.parse(form({ minimumFarms: "3" }))).toEqual({
      minimumFarms: 3,
      showPerFarmEstimates: false,
      releaseSchedule: "daily",
      releaseHour: 2,
    });
    expect(cooperativeSettingsSchema.safeParse(form({ minimumFarms: "3", releaseHour: "24" })).success).toBe(false);
    expect(cooperativeSettingsSchema.safeParse(form({ minimumFarms: "3", releaseSchedule: "hourly" })).success).toBe(false);
  });
});
