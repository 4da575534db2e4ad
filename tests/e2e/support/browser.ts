import { mkdtempSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const appUrl = process.env.APP_URL ?? "http://127.0.0.1:3100";
export const screenshotDir = path.join(process.env.RHIZO_TEST_RESULTS ?? "test-results", "screenshots");

/** Debian's Chromium, headless, with the background services that would call out switched off. */
/** `timezoneId`: the zone the browser reports (an IANA name); the machine's otherwise. */
export async function openBrowser(viewport = { width: 1280, height: 900 }, timezoneId?: string): Promise<BrowserContext> {
  mkdirSync(screenshotDir, { recursive: true });
  return chromium.launchPersistentContext(mkdtempSync(path.join(tmpdir(), "rhizomorph-chromium-")), {
    executablePath: "/usr/bin/chromium",
    headless: true,
    viewport,
    timezoneId,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

export async function screenshot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

/** Fails the test on any error the page logs (a 404 asset, a hydration error, a thrown exception). */
export function collectPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("pageerror", (error) => errors.push(error.message));
  page.on("console", (message) => {
    // A failed resource's message does not name it; its location does.
    if (message.type() === "error") errors.push(`${message.text()} (${message.location().url || "no address"})`);
  });
  return errors;
}

/** Accessibility problems axe-core rates serious or critical (WCAG 2 A and AA rules). */
export async function seriousAccessibilityProblems(page: Page): Promise<string[]> {
  const { default: AxeBuilder } = await import("@axe-core/playwright");
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa"]).analyze();
  return results.violations
    .filter((violation) => violation.impact === "serious" || violation.impact === "critical")
    .map((violation) => `${violation.id}: ${violation.help} (${violation.nodes.length} places)`);
}

/** The two widths every page must hold at: a phone held upright, and a common laptop screen. */
export const pageWidths = [390, 1366] as const;

/**
 * What axe-core finds on the page, of any impact, under the WCAG 2.0 and 2.1 A and AA rules;
 * element ids used twice (a label's `for` then points at whichever comes first); and a page wider
 * than the window (the phone would scroll sideways).
 */
export async function pageLayoutProblems(page: Page, { axe = true } = {}): Promise<string[]> {
  const problems: string[] = [];
  if (axe) {
    const { default: AxeBuilder } = await import("@axe-core/playwright");
    const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
    for (const violation of results.violations)
      problems.push(
        `axe ${violation.impact ?? ""} ${violation.id}: ${violation.help} at ${violation.nodes
          .slice(0, 3)
          .map((node) => node.target.join(" "))
          .join(", ")}`,
      );
  }
  const layout = await page.evaluate(() => {
    const ids = new Map<string, number>();
    for (const element of document.querySelectorAll("[id]")) ids.set(element.id, (ids.get(element.id) ?? 0) + 1);
    const widest = Array.from(document.querySelectorAll("body *"))
      .filter((element) => element.getBoundingClientRect().right > window.innerWidth + 1)
      // Only the outermost: a table inside a scrolling frame is wide on purpose.
      .filter((element) => !element.closest("[data-scrolls], .overflow-x-auto, .overflow-auto"))
      .slice(0, 3)
      .map(
        (element) =>
          `${element.tagName.toLowerCase()}${element.id ? `#${element.id}` : ""}.${(element.getAttribute("class") ?? "").split(" ").slice(0, 3).join(".")}`,
      );
    return {
      duplicates: [...ids].filter(([, count]) => count > 1).map(([id]) => id),
      overflow: document.documentElement.scrollWidth - window.innerWidth,
      widest,
    };
  });
  if (layout.duplicates.length) problems.push(`ids used twice: ${layout.duplicates.join(", ")}`);
  if (layout.overflow > 1) problems.push(`${layout.overflow}px wider than the window: ${layout.widest.join(", ")}`);
  return problems;
}
