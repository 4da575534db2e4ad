import type { Metadata } from "next";
import Link from "next/link";

export const metadata: Metadata = { title: "Not for your role" };

export default function ForbiddenPage() {
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="max-w-md rounded-xl border border-oat-300 bg-white p-6 shadow-sm">
        <h1 className="text-xl font-semibold text-moss-800">This page is not open to your role</h1>
        <p className="mt-3 text-ink-soft">
          Each member sees what their role needs: farm people see their own farm&apos;s rows, the coordinator runs the co-op, and observers
          read pooled results. If you think you should have access, ask the co-op coordinator.
        </p>
        <Link href="/" className="mt-5 inline-flex min-h-11 items-center rounded-lg bg-moss-600 px-4 font-semibold text-white">
          Back to your start page
        </Link>
      </div>
    </main>
  );
}
