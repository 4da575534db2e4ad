/**
 * Counts type assertions outside the tests: `x as T` (not `as const`, which only keeps literal
 * types) and non-null assertions `x!`. Each is a place where the compiler takes our word; the
 * count should only go down. `npm run count:casts` prints the totals and the files with the most.
 */
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import ts from "typescript";

const files = execFileSync("git", ["ls-files", "--cached", "--others", "--exclude-standard", "*.ts", "*.tsx", "*.mts"], {
  encoding: "utf8",
})
  .split("\n")
  .filter((file) => file && !file.startsWith("tests/") && !/\.test\.tsx?$/.test(file) && !file.endsWith(".d.ts"));

const perFile: { file: string; casts: number; nonNull: number }[] = [];
for (const file of files) {
  const source = ts.createSourceFile(file, readFileSync(file, "utf8"), ts.ScriptTarget.Latest, true);
  let casts = 0;
  let nonNull = 0;
  const visit = (node: ts.Node): void => {
    if (ts.isAsExpression(node) && !(ts.isTypeReferenceNode(node.type) && node.type.typeName.getText(source) === "const")) casts++;
    if (ts.isTypeAssertionExpression(node)) casts++;
    if (ts.isNonNullExpression(node)) nonNull++;
    ts.forEachChild(node, visit);
  };
  visit(source);
  if (casts || nonNull) perFile.push({ file, casts, nonNull });
}

const total = (key: "casts" | "nonNull") => perFile.reduce((sum, row) => sum + row[key], 0);
console.log(`as casts: ${total("casts")}, non-null assertions: ${total("nonNull")} (in ${files.length} files outside tests)`);
for (const row of perFile.sort((a, b) => b.casts + b.nonNull - (a.casts + a.nonNull)).slice(0, Number(process.argv[2] ?? 15))) {
  console.log(`${String(row.casts).padStart(4)} ${String(row.nonNull).padStart(4)}  ${row.file}`);
}
