import Link from "next/link";

/** A block, trial or upload that is not there (or not the viewer's to see) inside the signed-in area: the menu stays. */
export default function SignedInNotFound() {
  return (
    <div className="max-w-xl space-y-3">
      <h1 className="text-2xl font-semibold text-moss-800">Nothing to show at this address</h1>
      <p className="text-ink-soft">
        What this link pointed to is not there: it may have been removed, or it belongs to another farm. Pick what you need from the menu,
        or go back to your start page.
      </p>
      <Link href="/" className="inline-flex min-h-11 items-center rounded-lg bg-moss-600 px-4 font-semibold text-white">
        Back to your start page
      </Link>
    </div>
  );
}
