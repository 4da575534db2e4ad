// Adds up the vitest JSON reports of the phases that ran and prints one closing line.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";

const [directory, ...phases] = process.argv.slice(2);
let passed = 0;
let failed = 0;
let missing = 0;
for (const phase of phases) {
  const file = path.join(directory, `vitest-${phase}.json`);
  if (!existsSync(file)) {
    console.log(`${phase}: no report (the phase did not run)`);
    missing++;
    continue;
  }
  const report = JSON.parse(readFileSync(file, "utf8"));
  passed += report.numPassedTests;
  // A file that failed to load reports no tests of its own: count it as one failure.
  const brokenFiles = report.testResults.filter((file) => file.status === "failed" && file.assertionResults.length === 0).length;
  failed += report.numFailedTests + brokenFiles;
  console.log(`${phase}: ${report.numPassedTests} passed, ${report.numFailedTests} failed`);
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed > 0 || missing > 0 || passed === 0 ? 1 : 0);
