"use client";

import { PageError } from "@/components/ui/page-error";

export default function SeasonLogsError({ reset }: { reset: () => void }) {
  return (
    <PageError title="The season logs could not be shown" text="Something went wrong while loading your farm’s uploads." reset={reset} />
  );
}
