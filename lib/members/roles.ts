export type Role = "coordinator" | "farm_manager" | "grower" | "observer";

export interface Person {
  id: string;
  role: Role;
  farmId: string | null;
  active: boolean;
}

export const farmRoles: readonly Role[] = ["farm_manager", "grower"];

export function isFarmRole(role: Role): boolean {
  return farmRoles.includes(role);
}

/** Which roles a member may invite, and to which farm. */
export function invitableRoles(inviter: Role): Role[] {
  if (inviter === "coordinator") return ["farm_manager", "observer", "coordinator"];
  if (inviter === "farm_manager") return ["grower"];
  return [];
}

/** Why an invitation may not be sent, or null when it may. */
export function invitationProblem(inviter: { role: Role; farmId: string | null }, role: Role, farmId: string | null): string | null {
  if (!invitableRoles(inviter.role).includes(role)) return "Your role cannot invite someone into that role.";
  if (isFarmRole(role) && !farmId) return "Choose the farm this person will belong to.";
  if (!isFarmRole(role) && farmId) return "Co-op roles do not belong to a farm: leave the farm empty.";
  if (inviter.role === "farm_manager" && farmId !== inviter.farmId) return "You can invite people to your own farm only.";
  return null;
}

/**
 * Why the coordinator may not give `target` the role `newRole`, or null when it may.
 * `farmPeople` are the active people of the target's farm (the target included).
 */
export function roleChangeProblem(actor: Person, target: Person, newRole: Role, farmPeople: Person[]): string | null {
  if (actor.role !== "coordinator")
    return "Only the coordinator changes roles; a farm manager hands over with “Transfer the manager role”.";
  if (actor.id === target.id) return "You cannot change your own role: ask another coordinator.";
  if (!target.active) return "This person is deactivated: invite them again instead.";
  if (target.role === newRole) return "That is already their role.";
  if (isFarmRole(target.role) !== isFarmRole(newRole)) {
    return "A farm role and a co-op role cannot be swapped: deactivate the person and invite them into the new role.";
  }
  if (target.role === "farm_manager" && !otherActiveManager(target, farmPeople)) {
    return "This is the farm's only manager: make someone else the manager first.";
  }
  return null;
}

/** Why a person may not be deactivated (or removed from a farm), or null. */
export function deactivationProblem(actor: Person, target: Person, farmPeople: Person[]): string | null {
  if (actor.id === target.id) return "You cannot deactivate yourself.";
  if (!target.active) return "This person is already deactivated.";
  if (actor.role === "farm_manager") {
    if (target.farmId !== actor.farmId || target.role !== "grower") return "You can remove growers of your own farm only.";
    return null;
  }
  if (actor.role !== "coordinator") return "Your role cannot deactivate people.";
  if (target.role === "farm_manager" && !otherActiveManager(target, farmPeople)) {
    return "This is the farm's only manager: make someone else the manager first, or suspend the farm.";
  }
  return null;
}

/** A farm manager hands the role to one of their own active growers and becomes a grower. */
export function transferProblem(actor: Person, target: Person): string | null {
  if (actor.role !== "farm_manager") return "Only a farm manager can hand over the manager role.";
  if (actor.id === target.id) return "Choose someone other than yourself.";
  if (target.farmId !== actor.farmId || target.role !== "grower") return "Choose a grower of your own farm.";
  if (!target.active) return "That person is deactivated.";
  return null;
}

function otherActiveManager(target: Person, farmPeople: Person[]): boolean {
  return farmPeople.some(
    (person) => person.id !== target.id && person.active && person.role === "farm_manager" && person.farmId === target.farmId,
  );
}
