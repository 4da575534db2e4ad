import Link from "next/link";

/** A signed-out page's card with its heading (or the page's own), and a way back to sign in below it. */
export function PublicCard({ title, children, footer }: { title?: string; children: React.ReactNode; footer?: React.ReactNode }) {
  return (
    <>
      <div className="mt-8 rounded-xl border border-oat-300 bg-white p-6 shadow-sm">
        {title ? <h1 className="mb-4 text-xl font-semibold">{title}</h1> : null}
        {children}
      </div>
      <p className="mt-6 text-sm text-ink-soft">
        {footer ?? (
          <Link className="underline" href="/sign-in">
            Back to sign in
          </Link>
        )}
      </p>
    </>
  );
}
