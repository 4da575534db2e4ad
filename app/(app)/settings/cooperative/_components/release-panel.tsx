import { Notice } from "@/components/ui/notice";
import type { ReleaseStatus } from "@/lib/data/pooled-releases";
import { describeReleaseSchedule } from "@/lib/pooled";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";
import { ActionForm } from "@/components/forms/action-form";
import { cutReleaseNowAction } from "../actions";
import { agree, count } from "@/lib/words";

const outcomeLabels: Record<string, string> = {
  cut: "a release was published",
  waiting: "the release waited: too few farms had changed the figures",
  unchanged: "nothing had changed",
};

/** Releases of the pooled figures: which one is out, when the next is due, and what cutting one now would do, and why it would wait. */
export function ReleasePanel({ status, display }: { status: ReleaseStatus; display: TimeDisplay }) {
  const { latest, now } = status;
  const when = (iso: string) => formatDateTime(iso, display);
  return (
    <div className="space-y-4" data-testid="release-panel">
      <p>
        {latest ? (
          <>
            Members and observers see <strong>release {latest.number}</strong>, published {when(latest.cutAt)}.
          </>
        ) : (
          "No release has been published yet."
        )}{" "}
        Releases come {describeReleaseSchedule(status.schedule, status.at, display)}
        {status.nextDueAt ? `; the next is due ${when(status.nextDueAt)}` : ""}.
        {status.lastAttempt
          ? ` The last scheduled attempt, ${when(status.lastAttempt.at)}: ${outcomeLabels[status.lastAttempt.outcome] ?? status.lastAttempt.outcome}.`
          : ""}
      </p>
      {now.outcome === "cut" ? (
        <Notice title="Ready to publish">
          <p>
            A release now would give {count(now.figuresChanged, "figure")} new values, from changes by {count(now.farmsChanged, "farm")}.
          </p>
        </Notice>
      ) : now.outcome === "unchanged" ? (
        <Notice title="Nothing to publish">
          <p>No farm&apos;s data has changed since {latest ? `release ${latest.number}` : "the start"}.</p>
        </Notice>
      ) : (
        <Notice tone="caution" title="The next release waits">
          <p>
            {count(now.farmsChanged, "farm")} {agree(now.farmsChanged, "has", "have")} changed data since{" "}
            {latest ? `release ${latest.number}` : "the start"}. A figure takes a new value only when at least {now.minimumFarms} farms have
            changed it, so that comparing two releases never shows one farm&apos;s numbers.
          </p>
        </Notice>
      )}
      {now.outcome !== "unchanged" && now.waiting.length ? (
        <div>
          <h3 className="font-semibold text-moss-800">Figures that keep their last published values for now</h3>
          <ul className="mt-2 list-disc space-y-1 pl-5 text-sm" data-testid="waiting-figures">
            {now.waiting.map((entry) => (
              <li key={entry.strainName}>
                {entry.strainName} ({entry.figures.join(", ")}): changes from {count(entry.farmsChanged, "farm")} so far; needs{" "}
                {now.minimumFarms}.
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {status.refreshesPending ? (
        <p className="text-sm text-ink-soft">
          A farm&apos;s latest upload is still being added to the statistics; it joins a later release.
        </p>
      ) : null}
      <ActionForm
        action={cutReleaseNowAction}
        hidden={{ publish: "release" }}
        submitLabel="Publish a release now"
        pendingLabel="Publishing…"
        testId="cut-release"
      />
    </div>
  );
}
