import { describe, expect, it } from "vitest";
import { can, isMemberRole, memberRoles, permissions, type Action } from "./permissions";

// The product brief's table of who must get what done, written out action by action.
const expected: Record<Action, string[]> = {
  "account:manage": ["coordinator", "farm_manager", "grower", "observer"],
  "cautions:read": ["coordinator", "farm_manager", "grower", "observer"],
  "pooled-results:read": ["coordinator", "farm_manager", "grower", "observer"],
  "trial:read": ["coordinator", "farm_manager", "grower", "observer"],
  "registry:read": ["coordinator", "farm_manager", "grower", "observer"],
  "farm-data:read": ["farm_manager", "grower"],
  "season-log:upload": ["farm_manager", "grower"],
  "harvest:record": ["farm_manager", "grower"],
  // Issue #18: growers record rooms, regimes and moves; the manager alone renames or retires a room.
  "rooms:record": ["farm_manager", "grower"],
  "farm-data:correct": ["farm_manager", "grower"],
  "registry:propose": ["farm_manager", "grower"],
  "registry:add": ["coordinator", "farm_manager", "grower"],
  "trial-list:download": ["farm_manager", "grower"],
  "farm-data:export": ["farm_manager"],
  "rooms:manage": ["farm_manager"],
  "farm:withdraw": ["farm_manager"],
  "farm-staff:manage": ["farm_manager"],
  "trial:enrol": ["farm_manager"],
  "audit:read-farm": ["farm_manager"],
  "trial:manage": ["coordinator"],
  "trial:follow-all-farms": ["coordinator"],
  "registry:manage": ["coordinator"],
  "members:manage": ["coordinator"],
  "settings:manage": ["coordinator"],
  "audit:read-coop": ["coordinator"],
  "mail:read-outgoing": ["coordinator"],
};

describe("the permission map", () => {
  it("lists every action the brief names, and no other", () => {
    expect(Object.keys(permissions).sort()).toEqual(Object.keys(expected).sort());
  });

  for (const [action, allowed] of Object.entries(expected) as [Action, string[]][]) {
    it(`allows ${action} to ${allowed.join(", ")} only`, () => {
      for (const role of memberRoles) expect(can(role, action), `${role} → ${action}`).toBe(allowed.includes(role));
    });
  }

  it("never lets the coordinator or an observer touch a farm's raw rows", () => {
    for (const role of ["coordinator", "observer"] as const) {
      expect(can(role, "farm-data:read")).toBe(false);
      expect(can(role, "season-log:upload")).toBe(false);
      expect(can(role, "farm-data:export")).toBe(false);
    }
  });

  it("refuses a missing or unknown role", () => {
    expect(can(null, "trial:read")).toBe(false);
    expect(can(undefined, "trial:read")).toBe(false);
    expect(isMemberRole("admin")).toBe(false);
    expect(isMemberRole("grower")).toBe(true);
  });
});
