"use client";

import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { Button, ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import type { CommitReceipt, UploadView } from "@/lib/data/season-logs";
import { seasonLogColumns } from "@/lib/import/schema";
import { routeMessage } from "@/lib/queries/fetch-json";
import type { ParseChoices } from "@/lib/season-logs/report";
import { IssueTable } from "./issue-table";
import { PreviewOfChanges } from "./preview-of-changes";
import { formatDateTime, formatDay, type TimeDisplay } from "@/lib/time/display";
import { agree, count } from "@/lib/words";

type Phase = "pick" | "sending" | "review" | "committing" | "done";
type MassUnit = NonNullable<ParseChoices["defaultMassUnit"]>;
type DecimalMark = "." | ",";

/** Problems the mapping step answers: opening it is how the grower fixes them. */
const askedInMapping = new Set([
  "mass_without_unit",
  "ambiguous_decimal_mark",
  "ambiguous_date_order",
  "mixed_date_orders",
  "sheet_choice_needed",
]);

const wideTargets = [1, 2, 3, 4, 5, 6].flatMap((flush) => [
  { value: `flush_${flush}`, label: `Flush ${flush} fresh weight (one column per flush)` },
  { value: `flush_${flush}_date`, label: `Flush ${flush} harvest date` },
]);
const targetOptions = [
  ...seasonLogColumns.map((column) => ({ value: column.name, label: column.title })),
  ...wideTargets,
  { value: "ignore", label: "Leave this column out" },
];

async function messageOf(response: Response): Promise<string> {
  try {
    const body = routeMessage.safeParse(await response.json());
    if (body.success && body.data.message) return body.data.message;
  } catch {
    // not JSON: fall through to the status text
  }
  return `The server answered ${response.status}. Try again; if it keeps happening, tell the coordinator.`;
}

/** Sends the file as the request body so the browser can report upload progress. */
function sendFile(file: File, onProgress: (fraction: number) => void): Promise<UploadView> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("POST", "/api/season-logs");
    request.setRequestHeader("content-type", file.type || "application/octet-stream");
    request.setRequestHeader("x-file-name", encodeURIComponent(file.name));
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total);
    };
    request.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(request.responseText);
      } catch {
        // answered with something other than JSON
      }
      if (request.status >= 200 && request.status < 300) resolve(body as UploadView);
      else {
        const refusal = routeMessage.safeParse(body);
        reject(
          new Error(
            refusal.success
              ? refusal.data.message
              : `The server answered ${request.status}. Try again; if it keeps happening, tell the coordinator.`,
          ),
        );
      }
    };
    request.onerror = () =>
      reject(new Error("The file could not be sent: the connection dropped. Check your connection and upload it again."));
    request.send(file);
  });
}

function needsMapping(view: UploadView): boolean {
  const detected = view.report.detected;
  return (
    !detected.mapping.certain ||
    detected.mapping.unmatched.length > 0 ||
    detected.dateOrder === "ambiguous" ||
    view.report.issues.some((issue) => askedInMapping.has(issue.code))
  );
}

/** Pick or drop a file → progress → mapping (when unsure) → review → commit → receipt. */
export function SeasonLogUpload({ display }: { display: TimeDisplay }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [phase, setPhase] = useState<Phase>("pick");
  const [progress, setProgress] = useState(0);
  const [fileName, setFileName] = useState("");
  const [view, setView] = useState<UploadView | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [mapping, setMapping] = useState<Record<string, string>>({});
  const [dateOrder, setDateOrder] = useState<"" | "dmy" | "mdy">("");
  const [unit, setUnit] = useState<"" | MassUnit>("");
  const [decimals, setDecimals] = useState<Record<string, DecimalMark>>({});
  const [sheet, setSheet] = useState("");
  const [checking, setChecking] = useState(false);
  const [receipt, setReceipt] = useState<CommitReceipt | null>(null);
  const [dragging, setDragging] = useState(false);
  // What is stored but not in the file is kept unless the grower chooses otherwise, each time.
  const [removeNotInFile, setRemoveNotInFile] = useState(false);

  function show(next: UploadView) {
    setView(next);
    setRemoveNotInFile(false);
    const detected = next.report.detected;
    setMapping(Object.fromEntries(detected.mapping.columns.map((column) => [column.header, column.target ?? "ignore"])));
    setDateOrder(next.report.choices.dateOrder ?? (detected.dateOrder === "dmy" || detected.dateOrder === "mdy" ? detected.dateOrder : ""));
    setUnit(next.report.choices.defaultMassUnit ?? "");
    setDecimals(next.report.choices.decimalByColumn ?? {});
    setSheet(next.report.choices.sheet ?? detected.workbook?.sheet ?? "");
  }

  async function upload(file: File) {
    setProblem(null);
    setReceipt(null);
    setFileName(file.name);
    setProgress(0);
    setPhase("sending");
    try {
      show(await sendFile(file, setProgress));
      setPhase("review");
      router.refresh();
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
      setPhase("pick");
    }
  }

  function choices(): ParseChoices {
    const chosen: ParseChoices = { mapping };
    if (dateOrder) chosen.dateOrder = dateOrder;
    if (unit) chosen.defaultMassUnit = unit;
    if (Object.keys(decimals).length > 0) chosen.decimalByColumn = decimals;
    if (sheet && (view?.report.detected.workbook?.sheets.length ?? 0) > 1) chosen.sheet = sheet;
    return chosen;
  }

  async function post(path: string, extra: Record<string, unknown> = {}): Promise<Response> {
    return fetch(`/api/season-logs/${view!.upload.id}/${path}`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ ...choices(), ...extra }),
    });
  }

  async function checkAgain() {
    setChecking(true);
    setProblem(null);
    try {
      const response = await post("check");
      if (!response.ok) setProblem(await messageOf(response));
      else {
        show((await response.json()) as UploadView);
        router.refresh();
      }
    } finally {
      setChecking(false);
    }
  }

  async function commit() {
    setPhase("committing");
    setProblem(null);
    const response = await post("commit", { removeNotInFile });
    if (!response.ok) {
      setProblem(await messageOf(response));
      setPhase("review");
      return;
    }
    setReceipt((await response.json()) as CommitReceipt);
    setPhase("done");
    router.refresh();
  }

  function startOver() {
    setView(null);
    setReceipt(null);
    setProblem(null);
    setPhase("pick");
    if (input.current) input.current.value = "";
  }

  return (
    <div className="space-y-6">
      {problem ? (
        <Notice tone="danger" title="That did not work">
          <p data-testid="upload-problem">{problem}</p>
        </Notice>
      ) : null}

      {phase === "pick" ? (
        <Card title="1. Choose your season log">
          <label
            htmlFor="season-log-file"
            onDragOver={(event) => {
              event.preventDefault();
              setDragging(true);
            }}
            onDragLeave={() => setDragging(false)}
            onDrop={(event) => {
              event.preventDefault();
              setDragging(false);
              const file = event.dataTransfer.files[0];
              if (file) void upload(file);
            }}
            className={`flex min-h-32 cursor-pointer flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed p-6 text-center ${dragging ? "border-moss-600 bg-moss-50" : "border-oat-300 bg-oat-50"}`}
          >
            <span className="font-semibold text-moss-800">Drop the spreadsheet or CSV file here, or tap to choose it</span>
            <span className="text-sm text-ink-soft">
              An .xlsx or .ods workbook up to 20 MB, or a CSV export (comma or semicolon, any units) up to 50 MB.
            </span>
          </label>
          <input
            ref={input}
            id="season-log-file"
            name="file"
            type="file"
            accept=".csv,.tsv,.txt,.xlsx,.ods,text/csv,text/plain,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet,application/vnd.oasis.opendocument.spreadsheet"
            aria-label="Season log file (.xlsx, .ods or CSV)"
            className="mt-3 block min-h-11 w-full text-sm"
            onChange={(event) => {
              const file = event.target.files?.[0];
              if (file) void upload(file);
            }}
          />
        </Card>
      ) : null}

      {phase === "sending" ? (
        <Card title="Sending and checking your file">
          <p className="mb-2 text-sm text-ink-soft">{fileName}</p>
          <progress className="h-3 w-full accent-moss-600" value={progress} max={1} aria-label="Upload progress" />
          <p role="status" className="mt-2 text-sm">
            {progress < 1
              ? `Sent ${Math.round(progress * 100)} %`
              : "Sent. Reading every row and comparing it with what your farm has stored…"}
          </p>
        </Card>
      ) : null}

      {view && (phase === "review" || phase === "committing") ? (
        <>
          {view.alreadyImportedAt ? (
            <Notice title="Already imported">
              <p data-testid="already-imported">
                This file was already imported on {formatDay(view.alreadyImportedAt, display)}. Nothing will change; the copy you just sent
                is kept in the list below.
              </p>
            </Notice>
          ) : null}

          <MappingStep
            view={view}
            open={needsMapping(view)}
            mapping={mapping}
            onMapping={setMapping}
            dateOrder={dateOrder}
            onDateOrder={setDateOrder}
            unit={unit}
            onUnit={setUnit}
            decimals={decimals}
            onDecimals={setDecimals}
            sheet={sheet}
            onSheet={setSheet}
            checking={checking}
            onCheck={() => void checkAgain()}
          />

          <Card title="3. Review">
            <p className="mb-3 text-sm text-ink-soft" data-testid="review-summary">
              {view.upload.fileName}: {count(view.report.rowCount, "row")} · {count(view.report.errorCount, "error")} ·{" "}
              {count(view.report.warningCount, "warning")} ·{" "}
              {view.report.detected.workbook ? (
                <>
                  read from the sheet “{view.report.detected.workbook.sheet ?? "none"}” of the .{view.report.detected.workbook.kind} file,
                  with its cells’ types,{" "}
                </>
              ) : (
                <>
                  read as {view.report.detected.encoding}, “
                  {view.report.detected.delimiter === "\t" ? "tab" : view.report.detected.delimiter}” between columns, “
                  {view.report.detected.decimal}” as decimal mark,{" "}
                </>
              )}
              {view.report.detected.format === "wide" ? "one column per flush" : "one row per harvest"}
              {view.report.detected.dateOrder === "dmy"
                ? ", dates day first"
                : view.report.detected.dateOrder === "mdy"
                  ? ", dates month first"
                  : ""}
              .
            </p>
            {view.report.errorCount > 0 ? (
              <Notice tone="danger" title="Fix these before committing">
                <p>
                  The file has {count(view.report.errorCount, "error")}. Correct them in your spreadsheet and upload the corrected file, or
                  change the mapping above and check again. Nothing is saved to your blocks until you commit.
                </p>
              </Notice>
            ) : null}
            <div className="mt-4">
              <IssueTable issues={view.report.issues} />
            </div>
            {view.report.issues.length > 0 ? (
              <a
                className="mt-3 inline-flex min-h-11 items-center text-sm font-semibold text-moss-700 underline"
                href={`/api/season-logs/${view.upload.id}/report`}
              >
                Download the report (CSV)
              </a>
            ) : null}
          </Card>

          <PreviewOfChanges preview={view.report.preview} removeNotInFile={removeNotInFile} onRemoveNotInFile={setRemoveNotInFile} />

          <div className="flex flex-wrap gap-3">
            <Button type="button" onClick={() => void commit()} disabled={!view.canCommit || phase === "committing" || checking}>
              {phase === "committing" ? "Committing…" : "Commit to my farm's records"}
            </Button>
            <Button type="button" variant="secondary" onClick={startOver} disabled={phase === "committing"}>
              Upload a corrected file
            </Button>
          </div>
        </>
      ) : null}

      {phase === "done" && receipt ? (
        <Card title="Committed">
          <div data-testid="receipt" className="space-y-2 text-sm">
            <p>
              {receipt.fileName} was committed on {formatDateTime(receipt.committedAt, display)}.
            </p>
            <p>
              {count(receipt.counts.newBlocks, "new block")}, {count(receipt.counts.changedBlocks, "block changed", "blocks changed")},{" "}
              {count(receipt.counts.newHarvests, "new harvest")},{" "}
              {count(receipt.counts.changedHarvests, "harvest changed", "harvests changed")};{" "}
              {count(receipt.changedValues, "replaced value")} kept in the blocks’ history.
              {receipt.removedHarvests > 0
                ? ` ${count(receipt.removedHarvests, "harvest")} that ${agree(receipt.removedHarvests, "was", "were")} not in the file removed, as you chose.`
                : ""}
            </p>
          </div>
          <div className="mt-4 flex flex-wrap gap-3">
            <ButtonLink href="/blocks">See your blocks</ButtonLink>
            <Button type="button" variant="secondary" onClick={startOver}>
              Upload another file
            </Button>
          </div>
        </Card>
      ) : null}
    </div>
  );
}

function MappingStep(props: {
  view: UploadView;
  open: boolean;
  mapping: Record<string, string>;
  onMapping: (mapping: Record<string, string>) => void;
  dateOrder: "" | "dmy" | "mdy";
  onDateOrder: (order: "" | "dmy" | "mdy") => void;
  unit: "" | MassUnit;
  onUnit: (unit: "" | MassUnit) => void;
  decimals: Record<string, DecimalMark>;
  onDecimals: (decimals: Record<string, DecimalMark>) => void;
  sheet: string;
  onSheet: (sheet: string) => void;
  checking: boolean;
  onCheck: () => void;
}) {
  const detected = props.view.report.detected;
  const missing = detected.mapping.missingRequired;
  const sheets = detected.workbook?.sheets ?? [];
  // The columns whose numbers read two ways, and any the grower already chose a mark for.
  const decimalColumns = [...new Set([...(detected.ambiguousDecimalColumns ?? []), ...Object.keys(props.decimals)])];
  return (
    <Card title="2. Check the columns">
      <details open={props.open} className="space-y-4">
        <summary className="min-h-11 cursor-pointer content-center text-sm font-semibold text-moss-700">
          {props.open ? "Some columns, numbers or dates need your choice" : "Every column was recognised; open to change the mapping"}
        </summary>
        {missing.length > 0 ? (
          <Notice tone="caution" title="Columns not found">
            <p>
              No column was recognised as {missing.join(", ")}. Pick below which of your columns holds{" "}
              {missing.length === 1 ? "it" : "them"}.
            </p>
          </Notice>
        ) : null}
        {sheets.length > 1 ? (
          <div className="space-y-1">
            <label htmlFor="sheet" className="block text-sm font-medium">
              Which sheet holds the season log?
            </label>
            <select
              id="sheet"
              value={props.sheet}
              onChange={(event) => props.onSheet(event.target.value)}
              className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3"
            >
              {sheets.map((name) => (
                <option key={name} value={name}>
                  {name}
                </option>
              ))}
            </select>
          </div>
        ) : null}
        {decimalColumns.length > 0 ? (
          <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
            {decimalColumns.map((header, index) => (
              <div key={header} className="space-y-1">
                <label htmlFor={`decimal-${index}`} className="block text-sm font-medium">
                  Decimal mark in “{header}”
                </label>
                <select
                  id={`decimal-${index}`}
                  value={props.decimals[header] ?? ""}
                  onChange={(event) => {
                    const next = { ...props.decimals };
                    if (event.target.value === "") delete next[header];
                    else next[header] = event.target.value as DecimalMark;
                    props.onDecimals(next);
                  }}
                  className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3"
                >
                  <option value="">Not chosen: the numbers read two ways</option>
                  <option value=",">Comma (2,5 kg; 2.720 g is two thousand seven hundred and twenty)</option>
                  <option value=".">Point (2.5 kg; 2,720 g is two thousand seven hundred and twenty)</option>
                </select>
              </div>
            ))}
          </div>
        ) : null}
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          {detected.mapping.columns.map((column) => {
            const id = `map-${column.position}`;
            return (
              <div key={column.position} className="space-y-1">
                <label htmlFor={id} className="block text-sm font-medium">
                  Column “{column.header}”
                  {column.how === "guess" ? " (a guess: please confirm)" : column.how === "unmatched" ? " (not recognised)" : ""}
                </label>
                <select
                  id={id}
                  value={props.mapping[column.header] ?? "ignore"}
                  onChange={(event) => props.onMapping({ ...props.mapping, [column.header]: event.target.value })}
                  className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3"
                >
                  {targetOptions.map((option) => (
                    <option key={option.value} value={option.value}>
                      {option.label}
                    </option>
                  ))}
                </select>
              </div>
            );
          })}
        </div>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
          <div className="space-y-1">
            <label htmlFor="date-order" className="block text-sm font-medium">
              How are dates written?
            </label>
            <select
              id="date-order"
              value={props.dateOrder}
              onChange={(event) => props.onDateOrder(event.target.value as "" | "dmy" | "mdy")}
              className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3"
            >
              <option value="">Work it out from the file</option>
              <option value="dmy">Day first (21.03.2026, 21/03/2026)</option>
              <option value="mdy">Month first (03/21/2026)</option>
            </select>
          </div>
          <div className="space-y-1">
            <label htmlFor="default-unit" className="block text-sm font-medium">
              Unit for weights written without one
            </label>
            <select
              id="default-unit"
              value={props.unit}
              onChange={(event) => props.onUnit(event.target.value as "" | MassUnit)}
              className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3"
            >
              <option value="">None: every weight names its unit</option>
              <option value="g">grams (g)</option>
              <option value="kg">kilograms (kg)</option>
              <option value="lb">pounds (lb)</option>
              <option value="oz">ounces (oz)</option>
            </select>
          </div>
        </div>
        <Button type="button" variant="secondary" onClick={props.onCheck} disabled={props.checking}>
          {props.checking ? "Checking…" : "Check the file again with these choices"}
        </Button>
        <p className="text-xs text-ink-soft">Your choices are remembered for your farm’s next upload.</p>
      </details>
    </Card>
  );
}
