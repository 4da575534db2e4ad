"use client";

import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";

export default function SeasonLogsError({ reset }: { reset: () => void }) {
  return (
    <div className="space-y-4">
      <Notice tone="danger" title="The season logs could not be shown">
        <p>Something went wrong while loading your farm’s uploads. Try again; if it keeps happening, tell the coordinator.</p>
      </Notice>
      <Button type="button" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
