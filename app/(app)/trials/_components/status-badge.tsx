import { trialStatusLabels, type TrialStatus } from "@/lib/trials/lifecycle";

const tones: Record<TrialStatus, string> = {
  draft: "bg-oat-100 text-ink",
  open: "bg-moss-50 text-moss-800",
  running: "bg-moss-100 text-moss-800",
  collecting: "bg-caution-bg text-caution-ink",
  published: "bg-moss-700 text-white",
  withdrawn: "bg-oat-300 text-ink",
};

export function StatusBadge({ status }: { status: TrialStatus }) {
  return (
    <span data-testid="trial-status" className={`inline-block rounded-full px-3 py-1 text-xs font-semibold ${tones[status]}`}>
      {trialStatusLabels[status]}
    </span>
  );
}
