"use client";

import Link from "next/link";
import { Button } from "./button";
import { Notice } from "./notice";

/** What an area's error.tsx shows: what could not be shown, what to do, a way to try again and a way back. */
export function PageError({ title, text, reset }: { title: string; text: string; reset: () => void }) {
  return (
    <div className="space-y-4">
      <Notice tone="danger" title={title}>
        <p>{text} Try again; if it keeps happening, tell the coordinator.</p>
      </Notice>
      <div className="flex flex-wrap items-center gap-4">
        <Button type="button" onClick={reset}>
          Try again
        </Button>
        <Link href="/" className="font-semibold text-moss-700 underline underline-offset-4">
          Back to your start page
        </Link>
      </div>
    </div>
  );
}
