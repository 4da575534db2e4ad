import { can, type Action, type MemberRole } from "@/lib/auth/permissions";

export interface NavigationItem {
  href: string;
  label: string;
  action: Action;
}

/** The signed-in menu, in the order a member reads it; each entry shows only to roles that may open it. */
export const navigationItems: NavigationItem[] = [
  // First for the coordinator, so it is where they land.
  { href: "/coordinator", label: "Follow-up", action: "trial:follow-all-farms" },
  { href: "/my-farm", label: "My farm", action: "farm-data:read" },
  { href: "/season-logs", label: "Season logs", action: "season-log:upload" },
  { href: "/blocks", label: "Blocks & harvests", action: "farm-data:read" },
  { href: "/rooms", label: "Rooms", action: "farm-data:read" },
  { href: "/results", label: "Co-op results", action: "pooled-results:read" },
  { href: "/trials", label: "Trials", action: "trial:read" },
  { href: "/strains", label: "Strains", action: "registry:read" },
  { href: "/members", label: "Members", action: "members:manage" },
  { href: "/farm-people", label: "Farm people", action: "farm-staff:manage" },
  { href: "/activity", label: "Activity log", action: "audit:read-coop" },
  { href: "/farm-activity", label: "Activity log", action: "audit:read-farm" },
  { href: "/outgoing-mail", label: "Outgoing mail", action: "mail:read-outgoing" },
  { href: "/settings/cooperative", label: "Co-op settings", action: "settings:manage" },
  { href: "/settings", label: "Settings", action: "account:manage" },
];

export function navigationFor(role: MemberRole): NavigationItem[] {
  return navigationItems.filter((item) => can(role, item.action));
}

/** Where a member lands after signing in. */
export function homePathFor(role: MemberRole): string {
  return navigationFor(role)[0]?.href ?? "/settings";
}
