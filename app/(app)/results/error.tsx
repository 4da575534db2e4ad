"use client";

import { Notice } from "@/components/ui/notice";

export default function ResultsError({ reset }: { error: Error; reset: () => void }) {
  return (
    <Notice tone="danger" title="Co-op results could not be shown">
      <p>Something went wrong while loading this page. Try again; if it keeps happening, tell the coordinator.</p>
      <button type="button" className="min-h-11 font-semibold underline" onClick={reset}>Try again</button>
    </Notice>
  );
}
