/** Shown at once while a page of the signed-in area waits on the database; the menu stays usable. */
export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="space-y-4">
      <span className="sr-only">Loading…</span>
      <div aria-hidden="true" className="h-8 w-64 animate-pulse rounded bg-oat-200" />
      <div aria-hidden="true" className="h-4 w-full max-w-xl animate-pulse rounded bg-oat-200" />
      <div aria-hidden="true" className="h-40 w-full animate-pulse rounded-xl bg-oat-100" />
    </div>
  );
}
