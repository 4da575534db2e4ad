import { readFileSync } from "node:fs";
import path from "node:path";
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { can, type Action, type MemberRole } from "@/lib/auth/permissions";
import { superuserPool } from "../integration/support/database";
import { appUrl, openBrowser } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

/**
 * Every server action of the build, called over HTTP the way a browser calls it, as each role,
 * as the manager of another farm and signed out. The matrix names every action with the
 * permission it must enforce (or "public" for the signed-out pages); a test fails when the
 * build has an action the matrix does not name. Empty forms are sent: a role the action is
 * for gets past the guard and stops at validation, so nothing is changed.
 */
const matrix: Record<string, Action | "public"> = {
  "app/(app)/blocks/harvest/actions.ts#recordHarvestAction": "harvest:record",
  "app/(app)/blocks/[blockId]/actions.ts#correctBlockAction": "farm-data:correct",
  "app/(app)/blocks/[blockId]/actions.ts#correctHarvestAction": "farm-data:correct",
  "app/(app)/blocks/[blockId]/actions.ts#moveBlockAction": "rooms:record",
  "app/(app)/rooms/actions.ts#addRoomAction": "rooms:record",
  "app/(app)/rooms/actions.ts#recordRegimeAction": "rooms:record",
  "app/(app)/rooms/actions.ts#editRoomAction": "rooms:manage",
  "app/(app)/rooms/actions.ts#retireRoomAction": "rooms:manage",
  "app/(app)/season-logs/[uploadId]/undo/actions.ts#undoCommitAction": "farm-data:correct",
  "app/(app)/farm-people/actions.ts#inviteGrowerAction": "farm-staff:manage",
  "app/(app)/farm-people/actions.ts#removeGrowerAction": "farm-staff:manage",
  "app/(app)/farm-people/actions.ts#transferManagerAction": "farm-staff:manage",
  "app/(app)/farm-people/actions.ts#resendGrowerInvitationAction": "farm-staff:manage",
  "app/(app)/farm-people/actions.ts#cancelGrowerInvitationAction": "farm-staff:manage",
  "app/(app)/farm-people/data/actions.ts#withdrawFarmDataAction": "farm:withdraw",
  "app/(app)/members/actions.ts#admitFarmAction": "members:manage",
  "app/(app)/members/actions.ts#inviteMemberAction": "members:manage",
  "app/(app)/members/actions.ts#setFarmStatusAction": "members:manage",
  "app/(app)/members/actions.ts#changeRoleAction": "members:manage",
  "app/(app)/members/actions.ts#deactivatePersonAction": "members:manage",
  "app/(app)/members/actions.ts#resendInvitationAction": "members:manage",
  "app/(app)/members/actions.ts#cancelInvitationAction": "members:manage",
  "app/(app)/settings/actions.ts#changePasswordAction": "account:manage",
  "app/(app)/settings/actions.ts#updatePreferencesAction": "account:manage",
  "app/(app)/settings/actions.ts#signOutEverywhereAction": "account:manage",
  "app/(app)/settings/cooperative/actions.ts#updateCooperativeSettingsAction": "settings:manage",
  "app/(app)/settings/cooperative/actions.ts#cutReleaseNowAction": "settings:manage",
  "app/(app)/settings/cooperative/season-actions.ts#updateSeasonStartAction": "settings:manage",
  "app/(app)/settings/cooperative/upload-retention-actions.ts#updateUploadRetentionAction": "settings:manage",
  "app/(app)/strains/actions.ts#addRegistryEntryAction": "registry:add",
  "app/(app)/strains/actions.ts#moveRegistryEntryAction": "registry:manage",
  "app/(app)/strains/actions.ts#importRegistryAction": "registry:manage",
  "app/(app)/trials/actions.ts#saveTrialDraftAction": "trial:manage",
  "app/(app)/trials/actions.ts#moveTrialAction": "trial:manage",
  "app/(app)/trials/actions.ts#runAnalysisAction": "trial:manage",
  "app/(app)/trials/actions.ts#amendAnalysisAction": "trial:manage",
  "app/(app)/trials/actions.ts#inviteFarmsAction": "trial:manage",
  "app/(app)/trials/actions.ts#sendReminderAction": "trial:manage",
  "app/(app)/trials/actions.ts#respondToInvitationAction": "trial:enrol",
  "app/(app)/trials/actions.ts#askToJoinTrialAction": "trial:enrol",
  "app/(auth)/sign-in/actions.ts#signInAction": "public",
  "app/(auth)/accept-invitation/actions.ts#acceptInvitationAction": "public",
  "app/(auth)/accept-invitation/actions.ts#setNewPasswordAction": "public",
  "app/(auth)/reset-password/actions.ts#requestResetAction": "public",
  "app/(auth)/unsubscribe/[token]/actions.ts#chooseRemindersAction": "public",
};

const callers: { name: string; email: string; role: MemberRole }[] = [
  { name: "the coordinator", email: "coordinator@aldervalley.example", role: "coordinator" },
  { name: "Fernbrook's manager", email: "manager@fernbrook.example", role: "farm_manager" },
  { name: "Fernbrook's grower", email: "grower@fernbrook.example", role: "grower" },
  { name: "an observer", email: "observer@extension.example", role: "observer" },
  { name: "another farm's manager", email: "manager@hollowoak.example", role: "farm_manager" },
];

interface BuiltAction {
  id: string;
  key: string;
  page: string;
}

/** The build's own list of server actions, with the page each one is posted to. */
function builtActions(ids: { trialId: string; blockId: string; uploadId: string }): BuiltAction[] {
  const manifest = JSON.parse(
    readFileSync(path.join(process.env.NEXT_DIST_DIR ?? ".next", "server", "server-reference-manifest.json"), "utf8"),
  ) as {
    node: Record<string, { workers: Record<string, unknown>; filename: string; exportedName: string }>;
  };
  return Object.entries(manifest.node).map(([id, entry]) => {
    const worker = Object.keys(entry.workers)[0];
    const page = worker
      .replace(/^app/, "")
      .replace(/\/\([^)]+\)/g, "")
      .replace(/\/page$/, "")
      .replace("[trialId]", ids.trialId)
      .replace("[blockId]", ids.blockId)
      .replace("[uploadId]", ids.uploadId);
    return { id, key: `${entry.filename}#${entry.exportedName}`, page: page || "/" };
  });
}

type Outcome = "refused: role" | "refused: signed out" | "refused: origin" | "passed the guard";

/** Posts the action as the browser does from the app's own page (it names the page's origin). */
async function call(context: BrowserContext, action: BuiltAction, origin = appUrl): Promise<{ outcome: Outcome; status: number }> {
  const page = context.pages()[0] ?? (await context.newPage());
  const response = await page.request.post(`${appUrl}${action.page}`, {
    headers: { "next-action": action.id, accept: "text/x-component", origin },
    // React's encoding of (previous state, an empty form).
    multipart: { "0": JSON.stringify([{ status: "idle" }, "$K1"]) },
    maxRedirects: 0,
  });
  const text = await response.text();
  if (response.status() >= 300 && response.status() < 400 && (response.headers().location ?? "").includes("/sign-in")) {
    return { outcome: "refused: signed out", status: response.status() };
  }
  if (response.status() === 403 && text.includes("another site")) return { outcome: "refused: origin", status: response.status() };
  if (text.includes("Your role does not allow this.")) return { outcome: "refused: role", status: response.status() };
  if (text.includes("Your session has ended")) return { outcome: "refused: signed out", status: response.status() };
  return { outcome: "passed the guard", status: response.status() };
}

let browser: BrowserContext;
let inspector: Pool;
let actions: BuiltAction[];

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
  const trialId = (await inspector.query<{ id: string }>("select id from trials where code = 'T-2026-02'")).rows[0].id;
  // Fernbrook's, so that a caller of another farm is refused on a real row, not a missing one.
  const fernbrook = "(select id from farms where name ilike 'Fernbrook%')";
  const blockId = (await inspector.query<{ id: string }>(`select id from blocks where farm_id = ${fernbrook} limit 1`)).rows[0].id;
  const uploadId =
    (await inspector.query<{ id: string }>(`select id from uploads where farm_id = ${fernbrook} limit 1`)).rows[0]?.id ?? blockId;
  actions = builtActions({ trialId, blockId, uploadId });
});

afterAll(async () => {
  await browser?.close();
  await inspector?.end();
});

describe("server actions", () => {
  it("are all named in the matrix, and the matrix names no action the build lacks", () => {
    expect(actions.map((action) => action.key).sort()).toEqual(Object.keys(matrix).sort());
  });

  it("refuse a signed-out caller unless they belong to a public page", async () => {
    await browser.clearCookies();
    for (const action of actions) {
      const { outcome, status } = await call(browser, action);
      expect(status, action.key).toBeLessThan(500);
      if (matrix[action.key] === "public") expect(outcome, action.key).toBe("passed the guard");
      else expect(outcome, action.key).toBe("refused: signed out");
    }
  });

  it("answer a call from another site with 403, never a 500, whoever is signed in, and change nothing", async () => {
    await browser.clearCookies();
    const page = browser.pages()[0] ?? (await browser.newPage());
    await new SignInPage(page).signIn(callers[0].email);
    await new AppShell(page).waitUntilSignedIn();
    for (const action of actions) {
      const { outcome, status } = await call(browser, action, "https://attacker.example");
      expect(status, action.key).toBe(403);
      expect(outcome, action.key).toBe("refused: origin");
    }
  });

  for (const caller of callers) {
    it(`let ${caller.name} past the guard exactly where the permission map says`, async () => {
      await browser.clearCookies();
      const page = browser.pages()[0] ?? (await browser.newPage());
      await new SignInPage(page).signIn(caller.email);
      await new AppShell(page).waitUntilSignedIn();
      const unexpected: string[] = [];
      for (const action of actions) {
        const permission = matrix[action.key];
        if (permission === "public") continue;
        const { outcome, status } = await call(browser, action);
        const expected: Outcome = can(caller.role, permission) ? "passed the guard" : "refused: role";
        if (outcome !== expected || status >= 500) unexpected.push(`${action.key}: ${outcome} (HTTP ${status}), expected ${expected}`);
      }
      expect(unexpected).toEqual([]);
    });
  }
});
