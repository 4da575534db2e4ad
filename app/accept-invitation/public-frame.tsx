/** The plain frame of the signed-out pages: the product's name, a heading and a card. */
export function PublicFrame({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-md">
        <p className="text-3xl font-semibold tracking-tight text-moss-800">Rhizomorph</p>
        <div className="mt-8 rounded-xl border border-oat-300 bg-white p-6 shadow-sm">
          <h1 className="mb-4 text-xl font-semibold">{title}</h1>
          {children}
        </div>
        <p className="mt-6 text-sm text-ink-soft">
          <a className="underline" href="/sign-in">
            Back to sign in
          </a>
        </p>
      </div>
    </main>
  );
}
