"use client";

import { PageError } from "@/components/ui/page-error";

export default function ResultsError({ reset }: { reset: () => void }) {
  return <PageError title="Co-op results could not be shown" text="Something went wrong while loading this page." reset={reset} />;
}
