"use client";

import { PageError } from "@/components/ui/page-error";

export default function BlocksError({ reset }: { reset: () => void }) {
  return <PageError title="Your blocks could not be shown" text="Something went wrong while loading your farm’s blocks." reset={reset} />;
}
