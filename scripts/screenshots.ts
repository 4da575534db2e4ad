/**
 * Saves every page as every role at 390 and 1366 px (the browser tests' page list, so a new page
 * cannot be missed). Run by scripts/screenshots.sh against a server it started on the demo co-op.
 */
import { superuserPool } from "../tests/integration/support/database";
import { appUrl, openBrowser, pageWidths, screenshot, screenshotDir } from "../tests/e2e/support/browser";
import { menuOf, pageList, rolesToVisit, screenshotName } from "../tests/e2e/support/page-list";
import { AppShell, SignInPage } from "../tests/e2e/support/pages";
import { signOptOutToken } from "../lib/trials/reminder-opt-out";

async function main() {
  const inspector = superuserPool();
  const browser = await openBrowser();
  const pages = await pageList(
    inspector,
    (enrolment) => `/unsubscribe/${encodeURIComponent(signOptOutToken(enrolment, process.env.AUTH_SECRET ?? ""))}`,
  );
  await inspector.end();
  const page = browser.pages()[0] ?? (await browser.newPage());
  let saved = 0;
  const shoot = async (role: string, path: string) => {
    for (const width of pageWidths) {
      await page.setViewportSize({ width, height: width < 600 ? 844 : 900 });
      await page.goto(`${appUrl}${path}`, { waitUntil: "networkidle" });
      await screenshot(page, screenshotName(role, path, width));
      saved++;
    }
  };
  for (const path of pages.publicPages) await shoot("signed-out", path);
  for (const { role, email } of rolesToVisit) {
    await browser.clearCookies();
    await page.setViewportSize({ width: 1366, height: 900 });
    await new SignInPage(page).signIn(email);
    await new AppShell(page).waitUntilSignedIn();
    for (const path of [...new Set([...(await menuOf(page)), ...pages.detailPages[role]])]) await shoot(role, path);
    console.log(`${role}: done`);
  }
  await browser.close();
  console.log(`${saved} screenshots in ${screenshotDir}`);
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
