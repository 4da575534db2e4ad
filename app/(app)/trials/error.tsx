"use client";

import { PageError } from "@/components/ui/page-error";

export default function TrialsError({ reset }: { reset: () => void }) {
  return <PageError title="This trial page could not be shown" text="Something went wrong on our side." reset={reset} />;
}
