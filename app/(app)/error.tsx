"use client";

import { PageError } from "@/components/ui/page-error";

/** Any page of the signed-in area that failed without an error page of its own: the menu stays, and so does a way back. */
export default function SignedInError({ reset }: { reset: () => void }) {
  return (
    <PageError
      title="This page could not be shown"
      text="Something went wrong while loading it. Nothing you saved was lost."
      reset={reset}
    />
  );
}
