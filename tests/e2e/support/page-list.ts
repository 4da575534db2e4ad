import type { Page } from "playwright-core";
import type { Pool } from "pg";

/**
 * Every page of the app, as each role reaches it: the menu's pages (read from the page itself, so a
 * new menu entry is visited without a change here) and the detail pages below them, with real ids
 * from the demo co-op. The browser tests and `npm run screenshots` both walk this list.
 */

export const rolesToVisit = [
  { role: "coordinator", email: "coordinator@aldervalley.example" },
  { role: "farm manager", email: "manager@fernbrook.example" },
  { role: "grower", email: "grower@fernbrook.example" },
  { role: "observer", email: "observer@extension.example" },
] as const;

export type RoleToVisit = (typeof rolesToVisit)[number]["role"];

export interface PageList {
  /** Pages opened signed out, including an address the app does not have. */
  publicPages: string[];
  /** Detail pages per role, beyond the menu's. */
  detailPages: Record<RoleToVisit, string[]>;
}

export async function pageList(inspector: Pool, optOutLink: (enrolmentId: string) => string): Promise<PageList> {
  const one = async (query: string, values: unknown[] = []) => (await inspector.query<{ id: string }>(query, values)).rows[0]?.id;
  const fernbrook = await one("select id from farms where name = 'Fernbrook Farm'");
  const block = await one("select id from blocks where farm_id = $1 order by code limit 1", [fernbrook]);
  const published = await one("select id from trials where status = 'published' order by code limit 1");
  const draft = await one("select id from trials where status = 'draft' order by code limit 1");
  const enrolment = await one("select id from trial_enrolments where farm_id = $1 order by id limit 1", [fernbrook]);
  // The demo's rooms (db/seed-rooms.ts); /rooms itself is in the menu.
  const room = await one("select id from fruiting_rooms where farm_id = $1 order by name limit 1", [fernbrook]);
  const farm = [
    "/blocks/harvest",
    `/blocks/${block}`,
    "/season-logs/columns",
    `/trials/${published}`,
    `/trials/${published}/results`,
    `/trials/${published}/labels`,
    `/rooms/${room}`,
  ];
  return {
    publicPages: [
      "/sign-in",
      "/reset-password",
      "/accept-invitation?token=not-a-real-token",
      "/cautions",
      "/glossary",
      "/forbidden",
      optOutLink(enrolment),
      "/no-such-page",
    ],
    detailPages: {
      coordinator: [
        "/trials/new",
        `/trials/${published}`,
        `/trials/${published}/results`,
        ...(draft ? [`/trials/${draft}/edit`] : []),
        "/no-such-page",
      ],
      "farm manager": [...farm, "/farm-people/data"],
      grower: farm,
      observer: [`/trials/${published}`, `/trials/${published}/results`],
    },
  };
}

/** The addresses in the signed-in member's menu, in its order (the public pages linked below it are visited signed out). */
export async function menuOf(page: Page): Promise<string[]> {
  return page
    .getByRole("navigation", { name: "Main" })
    .locator("li a[href^='/']")
    .evaluateAll((links) => links.map((link) => link.getAttribute("href")!));
}

/** A file name for a page's screenshot: role, address and width, e.g. "grower-blocks-harvest-390". */
export function screenshotName(role: string, address: string, width: number): string {
  const slug =
    address
      .replace(/\?.*$/, "")
      .replace(/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/g, "one")
      .replace(/^\/unsubscribe\/.*/, "unsubscribe")
      .replace(/^\/+/, "")
      .replace(/[^a-z0-9]+/gi, "-")
      .slice(0, 60) || "start";
  return `${role.replace(/\s+/g, "-")}-${slug}-${width}`;
}
