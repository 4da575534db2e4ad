"use client";

import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";

export default function TrialsError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="space-y-4">
      <Notice tone="danger" title="This trial page could not be shown">
        <p>Something went wrong on our side. Try again; if it keeps happening, tell the coordinator what you were doing.</p>
      </Notice>
      <Button type="button" onClick={reset}>Try again</Button>
    </div>
  );
}
