import { describe, expect, it } from "vitest";
import { deactivationProblem, invitationProblem, roleChangeProblem, transferProblem, type Person } from "./roles";

const coordinator: Person = { id: "c", role: "coordinator", farmId: null, active: true };
const manager: Person = { id: "m", role: "farm_manager", farmId: "f1", active: true };
const grower: Person = { id: "g", role: "grower", farmId: "f1", active: true };
const otherGrower: Person = { id: "o", role: "grower", farmId: "f2", active: true };
const observer: Person = { id: "v", role: "observer", farmId: null, active: true };

describe("who may invite whom", () => {
  it("lets the coordinator invite a farm's manager and a manager invite their own growers", () => {
    expect(invitationProblem(coordinator, "farm_manager", "f1")).toBeNull();
    expect(invitationProblem(manager, "grower", "f1")).toBeNull();
  });
  it("refuses the wrong farm, a missing farm and roles above the inviter", () => {
    expect(invitationProblem(manager, "grower", "f2")).toMatch(/own farm/);
    expect(invitationProblem(manager, "farm_manager", "f1")).toMatch(/cannot invite/);
    expect(invitationProblem(coordinator, "farm_manager", null)).toMatch(/Choose the farm/);
    expect(invitationProblem(coordinator, "observer", "f1")).toMatch(/leave the farm empty/);
    expect(invitationProblem({ role: "grower", farmId: "f1" }, "grower", "f1")).toMatch(/cannot invite/);
  });
});

describe("role changes", () => {
  it("lets the coordinator make a grower a manager", () => {
    expect(roleChangeProblem(coordinator, grower, "farm_manager", [manager, grower])).toBeNull();
  });
  it("never leaves a farm without a manager", () => {
    expect(roleChangeProblem(coordinator, manager, "grower", [manager, grower])).toMatch(/only manager/);
    const second = { ...grower, role: "farm_manager" as const };
    expect(roleChangeProblem(coordinator, manager, "grower", [manager, second])).toBeNull();
  });
  it("refuses farm-to-co-op swaps, self changes and non-coordinators", () => {
    expect(roleChangeProblem(coordinator, grower, "observer", [grower])).toMatch(/cannot be swapped/);
    expect(roleChangeProblem(coordinator, coordinator, "observer", [])).toMatch(/own role/);
    expect(roleChangeProblem(manager, grower, "farm_manager", [manager, grower])).toMatch(/Only the coordinator/);
    expect(roleChangeProblem(coordinator, observer, "observer", [])).toMatch(/already/);
  });
});

describe("deactivation and hand-over", () => {
  it("lets a manager remove their own growers only", () => {
    expect(deactivationProblem(manager, grower, [manager, grower])).toBeNull();
    expect(deactivationProblem(manager, otherGrower, [])).toMatch(/own farm/);
    expect(deactivationProblem(manager, manager, [manager])).toMatch(/yourself/);
  });
  it("keeps the coordinator from removing a farm's only manager", () => {
    expect(deactivationProblem(coordinator, manager, [manager, grower])).toMatch(/only manager/);
    expect(deactivationProblem(coordinator, grower, [manager, grower])).toBeNull();
  });
  it("hands the manager role only to an active grower of the same farm", () => {
    expect(transferProblem(manager, grower)).toBeNull();
    expect(transferProblem(manager, otherGrower)).toMatch(/own farm/);
    expect(transferProblem(manager, { ...grower, active: false })).toMatch(/deactivated/);
    expect(transferProblem(grower, manager)).toMatch(/Only a farm manager/);
  });
});
