/**
 * The frame of the pages people open before they are signed in (sign in, accept an invitation,
 * reset a password, stop trial reminders): the product's name above the page's card. The folder
 * is a route group, so it adds nothing to the addresses; auth.config.ts lists them as public.
 */
export default function PublicLayout({ children }: { children: React.ReactNode }) {
  return (
    <main id="main" className="flex min-h-screen items-center justify-center px-4 py-10">
      <div className="w-full max-w-md">
        <p className="text-3xl font-semibold tracking-tight text-moss-800">Rhizomorph</p>
        {children}
      </div>
    </main>
  );
}
