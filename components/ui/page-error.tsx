"use client";

import { Button } from "./button";
import { Notice } from "./notice";

/** What an area's error.tsx shows: what could not be shown, what to do, and a way to try again. */
export function PageError({ title, text, reset }: { title: string; text: string; reset: () => void }) {
  return (
    <div className="space-y-4">
      <Notice tone="danger" title={title}>
        <p>{text} Try again; if it keeps happening, tell the coordinator.</p>
      </Notice>
      <Button type="button" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
