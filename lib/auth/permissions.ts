/**
 * Who may do what. This map is the only place roles meet actions: pages, route handlers
 * and server actions all ask `can(role, action)` through the guard in lib/auth/guard.ts.
 */
export const memberRoles = ["coordinator", "farm_manager", "grower", "observer"] as const;
export type MemberRole = (typeof memberRoles)[number];

export const roleLabels: Record<MemberRole, string> = {
  coordinator: "Co-op coordinator",
  farm_manager: "Farm manager",
  grower: "Grower",
  observer: "Observer",
};

const farmPeople: readonly MemberRole[] = ["farm_manager", "grower"];
const everyone: readonly MemberRole[] = memberRoles;

export const permissions = {
  "account:manage": everyone,
  "cautions:read": everyone,
  "pooled-results:read": everyone,
  "trial:read": everyone,
  "registry:read": everyone,

  "farm-data:read": farmPeople,
  "season-log:upload": farmPeople,
  "harvest:record": farmPeople,
  // Adding a room, a regime change, a block's move: recorded by whoever does the work, like a harvest.
  "rooms:record": farmPeople,
  // Editing or deleting a harvest, editing a block's values, undoing a season-log commit.
  "farm-data:correct": farmPeople,
  "registry:propose": farmPeople,
  // Adding an entry: the coordinator's goes straight in, a farm's waits as a proposal.
  "registry:add": ["coordinator", "farm_manager", "grower"],
  "trial-list:download": farmPeople,

  "farm-data:export": ["farm_manager"],
  // Renaming, resizing or retiring a room changes how the farm is set up, which is the manager's to decide.
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
} as const satisfies Record<string, readonly MemberRole[]>;

export type Action = keyof typeof permissions;

export function can(role: MemberRole | null | undefined, action: Action): boolean {
  if (!role) return false;
  const allowed: readonly MemberRole[] = permissions[action];
  return allowed.includes(role);
}

export function isMemberRole(value: unknown): value is MemberRole {
  return memberRoles.some((role) => role === value);
}
